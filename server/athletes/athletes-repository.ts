import type { Knex } from 'knex';
import type { AthleteDetail, AthleteSummary, ConsentState, InjuryEntry, PainEntry } from '../../src/contracts/api';
import { fromKilometres, type BodyRegion, type Surface } from '../../src/contracts/intake';
import type { AthleteRow, ConsentRow, InjuryRow, PainRow } from '../db/rows';

type SummaryRow = AthleteRow & {
  coach_name: string | null;
  invitation_pending: number;
  video_consent: number | null;
  max_pain: number | null;
};

function summarySelect(db: Knex, nowIso: string) {
  const latestVideoConsent = db('consents as c')
    .select('c.granted')
    .whereRaw('c.athlete_id = a.id')
    .andWhere('c.kind', 'video_recording')
    .orderBy('c.id', 'desc')
    .limit(1)
    .as('video_consent');
  const pendingInvitation = db.raw(
    `EXISTS (SELECT 1 FROM invitations i WHERE i.athlete_id = a.id AND i.used_at IS NULL AND i.revoked_at IS NULL AND i.expires_at > ?) AS invitation_pending`,
    [nowIso],
  );
  const maxPain = db('pain_entries as p').max('p.score').whereRaw('p.athlete_id = a.id').andWhere('p.current', true).as('max_pain');
  return db('athletes as a')
    .leftJoin('users as coach', 'coach.id', 'a.coach_id')
    .select('a.*', 'coach.name as coach_name', pendingInvitation, latestVideoConsent, maxPain);
}

function toSummary(r: SummaryRow): AthleteSummary {
  return {
    id: r.id,
    firstName: r.first_name,
    lastName: r.last_name,
    email: r.email,
    dateOfBirth: r.date_of_birth,
    goalEvent: r.goal_event,
    goalDate: r.goal_date,
    coachId: r.coach_id,
    coachName: r.coach_name,
    hasAccount: r.user_id !== null,
    invitationPending: Boolean(r.invitation_pending),
    videoConsent: Boolean(r.video_consent),
    maxPain: r.max_pain ?? null,
    createdAt: r.created_at,
    updatedAt: r.updated_at,
  };
}

/** Reads and writes athletes and their intake. Every query is scoped by clinic. */
export const athletesRepository = {
  async list(db: Knex, clinicId: number, nowIso: string): Promise<AthleteSummary[]> {
    const rows = (await summarySelect(db, nowIso)
      .where('a.clinic_id', clinicId)
      .orderBy([{ column: 'a.last_name' }, { column: 'a.first_name' }])) as SummaryRow[];
    return rows.map(toSummary);
  },

  /** The athlete with this id in this clinic, or undefined (callers answer 404). */
  find(db: Knex, clinicId: number, id: number): Promise<AthleteRow | undefined> {
    return db<AthleteRow>('athletes').where({ id, clinic_id: clinicId }).first();
  },

  findByEmail(db: Knex, clinicId: number, email: string): Promise<AthleteRow | undefined> {
    return db<AthleteRow>('athletes').where({ clinic_id: clinicId }).whereRaw('lower(email) = ?', [email.toLowerCase()]).first();
  },

  async detail(db: Knex, clinicId: number, id: number, nowIso: string, includeNotes: boolean): Promise<AthleteDetail | null> {
    const row = (await summarySelect(db, nowIso).where({ 'a.id': id, 'a.clinic_id': clinicId }).first()) as SummaryRow | undefined;
    if (!row) return null;
    const [injuries, pain, consents] = await Promise.all([
      db<InjuryRow>('injuries').where({ athlete_id: id }).orderBy('position'),
      db<PainRow>('pain_entries').where({ athlete_id: id, current: true }).orderBy('id'),
      db('consents as c')
        .leftJoin('users as u', 'u.id', 'c.recorded_by')
        .where('c.athlete_id', id)
        .orderBy('c.id', 'desc')
        .select<(ConsentRow & { recorded_by_name: string | null })[]>('c.*', 'u.name as recorded_by_name'),
    ]);
    const latest = (kind: ConsentRow['kind']): ConsentState | null => {
      const c = consents.find((x) => x.kind === kind);
      return c ? { granted: Boolean(c.granted), recordedAt: c.recorded_at, recordedByName: c.recorded_by_name ?? '' } : null;
    };
    const unit = row.distance_unit;
    const detail: AthleteDetail = {
      ...toSummary(row),
      heightCm: row.height_cm,
      distanceUnit: unit,
      weeklyDistance: row.weekly_km === null ? null : fromKilometres(row.weekly_km, unit),
      longestRecentRun: row.longest_run_km === null ? null : fromKilometres(row.longest_run_km, unit),
      surfaces: JSON.parse(row.surfaces) as Surface[],
      injuries: injuries.map((i): InjuryEntry => ({
        id: i.id,
        region: i.region as InjuryEntry['region'],
        side: i.side as InjuryEntry['side'],
        when: i.began,
        status: i.status as InjuryEntry['status'],
        notes: i.notes,
      })),
      pain: pain.map((p): PainEntry => ({ region: p.region as BodyRegion, score: p.score })),
      consents: { videoRecording: latest('video_recording'), shareStills: latest('share_stills') },
    };
    if (includeNotes) detail.notes = row.notes;
    return detail;
  },

  async insert(db: Knex, row: Omit<AthleteRow, 'id'>): Promise<number> {
    const [r] = await db('athletes').insert(row).returning('id');
    return (r as { id: number }).id;
  },

  async update(db: Knex, clinicId: number, id: number, patch: Partial<AthleteRow>): Promise<void> {
    await db('athletes').where({ id, clinic_id: clinicId }).update(patch);
  },

  async replaceInjuries(db: Knex, clinicId: number, athleteId: number, injuries: Omit<InjuryEntry, 'id'>[]): Promise<void> {
    await db('injuries').where({ athlete_id: athleteId }).delete();
    if (injuries.length) {
      await db('injuries').insert(
        injuries.map((i, position) => ({
          clinic_id: clinicId,
          athlete_id: athleteId,
          region: i.region,
          side: i.side,
          began: i.when,
          status: i.status,
          notes: i.notes,
          position,
        })),
      );
    }
  },

  /** Retires the current pain set (kept as history) and records the new one. */
  async replaceCurrentPain(db: Knex, clinicId: number, athleteId: number, pain: PainEntry[], by: number, at: string): Promise<void> {
    await db('pain_entries').where({ athlete_id: athleteId, current: true }).update({ current: false });
    if (pain.length) {
      await db('pain_entries').insert(
        pain.map((p) => ({
          clinic_id: clinicId,
          athlete_id: athleteId,
          region: p.region,
          score: p.score,
          current: true,
          source: 'intake',
          recorded_by: by,
          recorded_at: at,
        })),
      );
    }
  },

  /** Appends a consent row only when the state changes, so the history shows who changed what. */
  async recordConsent(
    db: Knex,
    clinicId: number,
    athleteId: number,
    kind: ConsentRow['kind'],
    granted: boolean,
    by: number,
    at: string,
  ): Promise<boolean> {
    const latest = await db<ConsentRow>('consents').where({ athlete_id: athleteId, kind }).orderBy('id', 'desc').first();
    if (latest && Boolean(latest.granted) === granted) return false;
    if (!latest && !granted) return false;
    await db('consents').insert({ clinic_id: clinicId, athlete_id: athleteId, kind, granted, recorded_by: by, recorded_at: at });
    return true;
  },
};
