import { assertShareConsent } from './consent-withdrawal';
import type { Knex } from 'knex';
import type { Logger } from 'pino';
import type { SessionUser } from '../../src/contracts/api';
import type { RenderStatus } from '../../src/contracts/sharing';
import { NotFoundError } from '../errors';
import { audit } from '../audit/audit-log';
import type { Action } from '../policy/access-table';
import { assertAthleteResource } from '../policy/athlete-resources';
import { assertRole } from '../policy/enforce';
import type { Mailer } from '../mail/mailer';
import type { Processing } from '../processing/processing';
import { sendShareNotice, type SharedKind } from '../mail/share-notice';

/** Columns every shared item (still, visit summary, annotated clip) has. */
export interface SharedRow {
  id: number;
  clinic_id: number;
  athlete_id: number;
  status: RenderStatus;
  published_at: string | null;
}

/** Progress 0–1 of a still or summary: 1 once ready, else its render's progress. */
export function renderProgress(r: { status: RenderStatus; item_done: number | null; item_total: number | null }): number {
  if (r.status === 'ready') return 1;
  return r.status === 'rendering' && r.item_total ? Math.min(1, (r.item_done ?? 0) / r.item_total) : 0;
}

/** Where each kind lives and how it is named in messages and the audit log. */
const KINDS: Record<SharedKind, { table: string; what: string; idKey: string }> = {
  still: { table: 'stills', what: 'Still', idKey: 'stillId' },
  summary: { table: 'visit_summaries', what: 'Visit summary', idKey: 'summaryId' },
  annotated_clip: { table: 'annotated_clips', what: 'Annotated clip', idKey: 'annotatedClipId' },
};

/**
 * The row of a still or summary this user may reach for `action`: staff any of their clinic's; an
 * athlete (`still:read`, `summary:read`) only their own that are published and ready (and pass
 * `visibleToAthlete`): the policy's `published` condition. Anything else is 404.
 */
export async function accessibleShared<R extends SharedRow>(
  db: Knex,
  kind: SharedKind,
  user: SessionUser,
  id: number,
  action: Action,
  visibleToAthlete: (row: R) => boolean = () => true,
): Promise<R> {
  const { table, what } = KINDS[kind];
  assertRole(user, action);
  const row = (await db(table).where({ id, clinic_id: user.clinicId }).first()) as R | undefined;
  if (!row) throw new NotFoundError(what);
  const published = !!row.published_at && row.status === 'ready' && visibleToAthlete(row);
  await assertAthleteResource(db, user, action, row, what, { published });
  return row;
}

export interface PublicationDeps {
  db: Knex;
  mailer: Mailer;
  logger: Logger;
  publicUrl: string;
  clock: () => Date;
}

/**
 * Publishes (audit entry + one e-mail notice to the athlete) or unpublishes a shared item. The
 * caller checks first that it may be published. Publishing what is already published changes
 * nothing and sends nothing.
 */
export async function setPublication(
  d: PublicationDeps,
  kind: SharedKind,
  user: SessionUser,
  row: SharedRow,
  publish: boolean,
): Promise<void> {
  const { table, idKey } = KINDS[kind];
  if (publish && row.published_at) return;
  if (publish) await assertShareConsent(d.db, row.athlete_id);
  const at = d.clock().toISOString();
  // Only a change counts: of two publishes sent at the same moment (a double click, a retry) one
  // changes the row, and only that one is audited and e-mails the athlete.
  const changed = await d
    .db(table)
    .where({ id: row.id })
    .where((q) => (publish ? q.whereNull('published_at') : q.whereNotNull('published_at')))
    .update(
      publish ? { published_at: at, published_by: user.id, updated_at: at } : { published_at: null, published_by: null, updated_at: at },
    );
  if (!changed) return;
  await audit(d.db, {
    clinicId: user.clinicId,
    actorId: user.id,
    athleteId: row.athlete_id,
    action: `${kind}.${publish ? 'published' : 'unpublished'}`,
    detail: { [idKey]: row.id },
  });
  if (publish) await sendShareNotice({ db: d.db, mailer: d.mailer, logger: d.logger, publicUrl: d.publicUrl }, row.athlete_id, kind);
}

/**
 * Deletes a shared item: cancels its render if one is queued or running, removes its files
 * (`removeFiles`), deletes its row and writes `<kind>.deleted` in the audit log. The caller checks first
 * that the user may delete it.
 */
export async function deleteShared(
  d: { db: Knex; processing: Pick<Processing, 'cancel'> },
  kind: SharedKind,
  user: SessionUser,
  row: SharedRow,
  removeFiles: () => Promise<void>,
): Promise<void> {
  const { table, idKey } = KINDS[kind];
  await d.processing.cancel(kind, row.id);
  // Files first: a server stop halfway leaves the row, so the item can be deleted again (the other
  // order would leave files no row points to). Once more after, for a render that finished meanwhile.
  await removeFiles();
  await d.db(table).where({ id: row.id }).delete();
  await removeFiles();
  await audit(d.db, {
    clinicId: user.clinicId,
    actorId: user.id,
    athleteId: row.athlete_id,
    action: `${kind}.deleted`,
    detail: { [idKey]: row.id },
  });
}
