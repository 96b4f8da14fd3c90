import crypto from 'node:crypto';
import os from 'node:os';
import type { Db } from '../db/knex';

/** How long a claim holds without renewal: a lapsed claim is taken over, and swept, after this. */
export const UPLOAD_CLAIM_LEASE_MS = 20_000;

/**
 * Claims on finished resumable uploads across server processes (table `resumable_upload_claims`):
 * whoever holds an upload's claim is the one making it into a clip. A claim is renewed while held
 * and lapses when its process dies, so a stranded upload is accepted again later. A claim whose
 * holder was a process of this machine that is gone (SIGKILL, a crash) is taken over at once.
 */
export interface UploadClaims {
  /** Takes the claim on upload `id`; answers its release, or null while another process holds it. */
  take(id: string): Promise<(() => Promise<void>) | null>;
  /**
   * Removes claims nobody holds any more: lapsed ones (past their lease) and those of processes of
   * this machine that are gone. Answers how many went. Run at start and with the uploads sweep.
   */
  sweep(): Promise<number>;
}

/** The claims this process holds now (of every `uploadClaims` in it): a claim naming this process but not here is a predecessor's. */
const heldHere = new Set<string>();

/**
 * Whether a claim's holder (`host:pid:uuid`) was a process of this machine that is gone: its pid
 * runs nothing, or it is this process's pid (a restarted container's server has the same one) but
 * not a claim this process holds. Another machine's claim is never judged here: it lapses.
 */
export function holderGone(holder: string): boolean {
  const [host, pidText] = holder.split(':');
  if (host !== os.hostname()) return false;
  const pid = Number(pidText);
  if (!Number.isSafeInteger(pid) || pid <= 0) return false;
  if (pid === process.pid) return !heldHere.has(holder);
  try {
    process.kill(pid, 0);
    return false;
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === 'ESRCH';
  }
}

export function uploadClaims(db: Db, leaseMs = UPLOAD_CLAIM_LEASE_MS): UploadClaims {
  const table = 'resumable_upload_claims';
  const expiry = () => new Date(Date.now() + leaseMs).toISOString();
  return {
    async take(id) {
      const holder = `${os.hostname()}:${process.pid}:${crypto.randomUUID()}`;
      heldHere.add(holder);
      let held = false;
      for (let tries = 0; tries < 3 && !held; tries++) {
        await db(table).insert({ upload_id: id, holder, expires_at: expiry() }).onConflict('upload_id').ignore();
        const row = await db(table)
          .where({ upload_id: id })
          .first<{ holder: string; expires_at: string } | undefined>('holder', 'expires_at');
        if (!row) continue; // released in between: insert again
        held = row.holder === holder;
        if (held) break;
        // A lapsed claim, or one whose process is gone, is taken over; only one of several takers
        // matches the row (the first changes its holder).
        if (row.expires_at >= new Date().toISOString() && !holderGone(row.holder)) break;
        held = (await db(table).where({ upload_id: id, holder: row.holder }).update({ holder, expires_at: expiry() })) === 1;
      }
      if (!held) {
        heldHere.delete(holder);
        return null;
      }
      const renewal = setInterval(() => {
        void db(table)
          .where({ upload_id: id, holder })
          .update({ expires_at: expiry() })
          .catch(() => undefined);
      }, leaseMs / 4);
      renewal.unref();
      return async () => {
        clearInterval(renewal);
        try {
          await db(table).where({ upload_id: id, holder }).delete();
        } finally {
          heldHere.delete(holder);
        }
      };
    },

    async sweep() {
      const now = new Date().toISOString();
      let removed = await db(table).where('expires_at', '<', now).delete();
      const rows = (await db(table).select('upload_id', 'holder')) as { upload_id: string; holder: string }[];
      for (const row of rows) if (holderGone(row.holder)) removed += await db(table).where(row).delete();
      return removed;
    },
  };
}
