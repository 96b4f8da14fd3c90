/**
 * Several machines' worth of processes on one PostgreSQL database and one S3-compatible bucket
 * (s3rver, the local fake of the S3 API): two web servers (A and B, no worker of their own) and two
 * worker processes (`npm run worker`). A coach signed in on A uploads three clips and follows the
 * athlete's progress stream on A; once a clip has its frames, a still of it is requested on B with
 * the session made on A (sessions live in the database); one worker is killed with SIGKILL in the
 * middle of an extraction. Every clip ends ready with every frame (counted by ffprobe
 * -count_frames, the outside reference, and listed in the bucket), the still ends ready, the items
 * came to the workers through pg-boss, and the stream on A showed each clip's progress and the
 * still's (made in the worker processes, so carried by LISTEN/NOTIFY: on PostgreSQL no process
 * reads the table for it) up to ready. Finally no object in the bucket is one that no row (or the
 * manifest a row leads to) names, and every object they name is there.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BOSS_SCHEMA, ITEMS_QUEUE } from '../../server/processing/item-dispatch';
import { selectRows } from '../../server/db/dialect';
import {
  coachFollowing,
  killMidExtraction,
  processesApart,
  sawClipToReady,
  threeClips,
  uploadClips,
  waitClipsReady,
  type ProcessesApart,
} from '../support/processes-flow';
import { keysNamedByRows, startBucket, type TestBucket } from '../support/s3-bucket';
import type { ServerProcess } from '../support/server-process';
import { Client } from '../support/test-app';
import { onPostgres, titleSkippedWhen } from '../support/test-db';
import { ffprobeCounted } from './media/fixtures';

let run: ProcessesApart | undefined;
let bucket: TestBucket | undefined;

beforeAll(async () => {
  if (!onPostgres) return;
  run = await processesApart('several-servers');
  bucket = await startBucket(path.join(run.dir, 's3'));
});
afterAll(async () => {
  await run?.stop();
  await bucket?.close();
});

describe('two web servers and two workers on PostgreSQL and an S3-compatible bucket', () => {
  it.skipIf(!onPostgres)(
    titleSkippedWhen(
      !onPostgres,
      'a coach on server A follows three clips and a still asked for on server B to ready while a worker is killed mid-extraction; nothing unnamed is left in the bucket',
      'needs DATABASE_URL: runs in the PostgreSQL run of the suite',
    ),
    async () => {
      const files = await threeClips(run!.dir);
      const db = await run!.start(2, bucket!.env);
      const [a, b] = run!.servers as [ServerProcess, ServerProcess];
      const { client: onA, athleteId, stream } = await coachFollowing(a.url);
      const clipIds = await uploadClips(onA, athleteId, files);

      const killed = await killMidExtraction(db, run!.workers[0]!);

      // A still of the first clip to have its frames, asked for on B with the session made on A.
      const first = await stream.waitFor((e) => e.subject === 'clip' && clipIds.includes(e.id) && e.state === 'ready', 240_000);
      const cookie = onA.cookieHeader();
      const token = await onA.xsrf();
      const asked = await new Client(b.url).agent
        .post(`/api/clips/${first.id}/stills`)
        .set('Cookie', `${cookie}; XSRF-TOKEN=${encodeURIComponent(token)}`)
        .set('X-XSRF-TOKEN', token)
        .send({ frameIndex: 10, caption: 'Toe-off, right', showAngles: true });
      expect(asked.status, JSON.stringify(asked.body)).toBe(202);
      const stillId = asked.body.id as number;

      const ready = await waitClipsReady(onA, clipIds);
      const takenOver = await db('processed_items').where({ id: killed.id }).first();
      expect(takenOver.state).toBe('ready');
      expect(takenOver.attempts).toBeGreaterThanOrEqual(2);

      // The items travelled as pg-boss jobs (one per clip and the still at least; the killed one was offered again or swept).
      const [jobs] = await selectRows<{ n: string }>(db, `select count(*) as n from ${BOSS_SCHEMA}.job where name = ?`, [ITEMS_QUEUE]);
      const [archived] = await selectRows<{ n: string }>(db, `select count(*) as n from ${BOSS_SCHEMA}.archive where name = ?`, [
        ITEMS_QUEUE,
      ]);
      expect(Number(jobs!.n) + Number(archived!.n)).toBeGreaterThanOrEqual(clipIds.length + 1);

      // The coach on A saw every clip's progress, made in the worker processes, up to ready, and the still's.
      for (const id of clipIds) expect(await sawClipToReady(stream, id)).toBe(true);
      await stream.waitFor((e) => e.subject === 'still' && e.id === stillId && e.state === 'ready', 120_000);
      stream.close();
      const still = (await onA.get(`/api/stills/${stillId}`)).body;
      expect(still.status).toBe('ready');
      const png = await onA.binary(`/api/stills/${stillId}/image.png`);
      expect(png.status).toBe(200);
      expect((png.body as Buffer).subarray(1, 4).toString()).toBe('PNG');

      // B serves the same clip with A's session.
      const clipOnB = await new Client(b.url).agent.get(`/api/clips/${clipIds[0]}`).set('Cookie', cookie);
      expect(clipOnB.status).toBe(200);
      expect(clipOnB.body.status).toBe('ready');

      // Every frame is in the bucket (listed once nothing is being written).
      for (const [i, id] of clipIds.entries()) {
        expect((await bucket!.store.list(`clips/${id}/frames/`)).length).toBe(ready.get(id)!.frameCount);
        expect(ready.get(id)!.frameCount).toBe((await ffprobeCounted(files[i]!)).nbReadFrames);
      }

      // Every object in the bucket is named by a row (or the manifest a row leads to), and every named one is there.
      const inBucket = await bucket!.allKeys();
      const named = await keysNamedByRows(db, bucket!.store, clipIds);
      expect(inBucket.filter((k) => !named.includes(k))).toEqual([]);
      expect(named.filter((k) => !inBucket.includes(k))).toEqual([]);
    },
    420_000,
  );
});
