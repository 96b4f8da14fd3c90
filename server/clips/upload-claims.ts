import crypto from 'node:crypto';
import os from 'node:os';
import type { Db } from '../db/knex';

/** How long a claim holds without renewal: a killed holder's claim is taken over after this. */
export const UPLOAD_CLAIM_LEASE_MS = 20_000;

/**
 * Claims on finished resumable uploads across server processes (table `resumable_upload_claims`):
 * whoever holds an upload's claim is the one making it into a clip. A claim is renewed while held
 * and lapses when its process dies, so a stranded upload is accepted again later.
 */
export interface UploadClaims {
  /** Takes the claim on upload `id`; answers its release, or null while another process holds it. */
  take(id: string): Promise<(() => Promise<void>) | null>;
}

export function uploadClaims(db: Db, leaseMs = UPLOAD_CLAIM_LEASE_MS): UploadClaims {
  const table = 'resumable_upload_claims';
  const expiry = () => new Date(Date.now() + leaseMs).toISOString();
  return {
    async take(id) {
      const holder = `${os.hostname()}:${process.pid}:${crypto.randomUUID()}`;
      await db(table).insert({ upload_id: id, holder, expires_at: expiry() }).onConflict('upload_id').ignore();
      let held = (await db(table).where({ upload_id: id }).first<{ holder: string } | undefined>('holder'))?.holder === holder;
      // A lapsed claim (its holder was killed) is taken over; only one of several takers matches the row.
      if (!held) {
        held =
          (await db(table)
            .where({ upload_id: id })
            .where('expires_at', '<', new Date().toISOString())
            .update({ holder, expires_at: expiry() })) === 1;
      }
      if (!held) return null;
      const renewal = setInterval(() => {
        void db(table)
          .where({ upload_id: id, holder })
          .update({ expires_at: expiry() })
          .catch(() => undefined);
      }, leaseMs / 4);
      renewal.unref();
      return async () => {
        clearInterval(renewal);
        await db(table).where({ upload_id: id, holder }).delete();
      };
    },
  };
}
