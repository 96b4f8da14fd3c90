import { Router, type Request, type Response } from 'express';
import { PROCESSING_EVENT, type ProcessingEvent } from '../../src/contracts/processing';
import type { Db } from '../db/knex';
import { currentUser } from '../http/access';
import { idParam } from '../http/validate';
import type { UserRevocations } from '../http/sessions';
import { accessibleAthlete } from '../policy/athlete-resources';
import { may, permit } from '../policy/enforce';
import type { Processing } from './processing';
import type { ProgressNotice } from './progress-channel';
import type { ProgressRelay } from './progress-relay';

export interface ProcessingEventsDeps {
  db: Db;
  processing: Processing;
  /** Other processes' changes (separate workers), read while someone follows. */
  relay: ProgressRelay;
  /** Ends a user's streams when they are signed out everywhere. */
  revocations: UserRevocations;
}

const STREAM_HEADERS = {
  'Content-Type': 'text/event-stream; charset=utf-8',
  'Cache-Control': 'no-store',
  Connection: 'keep-alive',
  'X-Accel-Buffering': 'no',
};

/**
 * A HEAD request gets the stream's headers and its answer ends: it can carry no events, and Node
 * holds a HEAD answer's headers until it ends (the caller would wait forever, subscribed).
 */
function headOnly(req: Request, res: Response): boolean {
  if (req.method !== 'HEAD') return false;
  res.writeHead(200, STREAM_HEADERS).end();
  return true;
}

/** Opens a server-sent-events answer. */
function openStream(res: Response): (event: ProcessingEvent) => void {
  res.writeHead(200, STREAM_HEADERS);
  res.write('retry: 3000\n\n');
  return (event) => res.write(`event: ${PROCESSING_EVENT}\ndata: ${JSON.stringify(event)}\n\n`);
}

/**
 * `GET /api/athletes/:id/processing-events`: the one progress stream of an athlete's processed
 * items (clips' frames, stills, visit summaries), for every page that shows them. Staff see every
 * kind; the athlete sees the kinds that say so (their clips). Every queued or running item once on
 * connecting, then every change.
 */
export function processingEventsRoutes(d: ProcessingEventsDeps): Router {
  const router = Router();
  router.get('/athletes/:id/processing-events', permit('processing:follow'), async (req, res) => {
    const athleteId = idParam(req.params, 'Athlete');
    const user = currentUser(req);
    await accessibleAthlete(d.db, user, athleteId, 'processing:follow');
    if (headOnly(req, res)) return;
    const staff = may(user, 'processing:see-all');
    const visible = (n: ProgressNotice) => n.clinicId === user.clinicId && (staff || n.athleteSees);
    const send = openStream(res);
    // Subscribed before reading the current state, so nothing falls between the two.
    const unsubscribe = d.processing.channel.subscribe(athleteId, (n) => {
      if (visible(n)) send(n.event);
    });
    await follow(req, res, user.id, unsubscribe, () => d.processing.unfinishedFor(athleteId), visible, send);
  });

  /**
   * `GET /api/clinic/processing-events`: the same stream for the clinic's own processed items,
   * about no athlete (exercises' demonstration clips), for its staff.
   */
  router.get('/clinic/processing-events', permit('processing:follow-clinic'), async (req, res) => {
    const user = currentUser(req);
    if (headOnly(req, res)) return;
    const send = openStream(res);
    const unsubscribe = d.processing.channel.subscribeClinic(user.clinicId, (n) => send(n.event));
    await follow(
      req,
      res,
      user.id,
      unsubscribe,
      () => d.processing.unfinishedForClinic(user.clinicId),
      () => true,
      send,
    );
  });

  /** Sends what is unfinished now, keeps the answer alive and ends it with the request or the user's sessions. */
  async function follow(
    req: Request,
    res: Response,
    userId: number,
    unsubscribe: () => void,
    unfinished: () => Promise<ProgressNotice[]>,
    visible: (n: ProgressNotice) => boolean,
    send: (event: ProcessingEvent) => void,
  ): Promise<void> {
    const unfollow = d.relay.follow();
    for (const n of await unfinished()) if (visible(n)) send(n.event);
    const ping = setInterval(() => res.write(': keep-alive\n\n'), 15_000);
    const unrevoke = d.revocations.onRevoke(userId, () => res.end());
    req.on('close', () => {
      clearInterval(ping);
      unsubscribe();
      unfollow();
      unrevoke();
    });
  }
  return router;
}
