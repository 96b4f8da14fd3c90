import type { Knex } from 'knex';

export interface AuditEntry {
  clinicId: number;
  actorId: number | null;
  athleteId?: number | null;
  /** Verb in `area.action` form, e.g. `athlete.intake_updated`. */
  action: string;
  detail?: Record<string, unknown>;
}

/** Appends to the audit log: who did what to which athlete, when. */
export async function audit(db: Knex, entry: AuditEntry, at = new Date().toISOString()): Promise<void> {
  await db('audit_log').insert({
    clinic_id: entry.clinicId,
    actor_id: entry.actorId,
    athlete_id: entry.athleteId ?? null,
    action: entry.action,
    detail: entry.detail ? JSON.stringify(entry.detail) : null,
    at,
  });
}
