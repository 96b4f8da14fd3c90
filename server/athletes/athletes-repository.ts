import type { Knex } from 'knex';
import type { AthleteDetail, AthleteSummary, ConsentState, InjuryEntry, PainEntry } from '../../src/contracts/api';
import { fromKilometres, type BodyRegion, type Surface } from '../../src/contracts/intake';
import type { AthleteRow, ConsentRow, InjuryRow, PainRow } from '../db/rows';
import { preparedRead } from '../db/prepared-read';

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

/** The columns a roster line needs. */
type RosterRow = Pick<
  SummaryRow,
  | 'id'
  | 'first_name'
  | 'last_name'
  | 'email'
  | 'date_of_birth'
  | 'goal_event'
  | 'goal_date'
  | 'coach_id'
  | 'user_id'
  | 'created_at'
  | 'updated_at'
  | 'coach_name'
  | 'invitation_pending'
  | 'video_consent'
  | 'max_pain'
>;

/** The roster as one prepared read (the same figures as {@link summarySelect}, only the columns a line shows). */
const ROSTER_SQL = `SELECT a.id, a.first_name, a.last_name, a.email, a.date_of_birth, a.goal_event, a.goal_date, a.coach_id, a.user_id,
    a.created_at, a.updated_at, coach.name AS coach_name,
    EXISTS (SELECT 1 FROM invitations i
      WHERE i.athlete_id = a.id AND i.used_at IS NULL AND i.revoked_at IS NULL AND i.expires_at > ?) AS invitation_pending,
    (SELECT c.granted FROM consents c WHERE c.athlete_id = a.id AND c.kind = 'video_recording' ORDER BY c.id DESC LIMIT 1) AS video_consent,
    (SELECT MAX(p.score) FROM pain_entries p WHERE p.athlete_id = a.id AND p.current) AS max_pain
  FROM athletes a LEFT JOIN users coach ON coach.id = a.coach_id
  WHERE a.clinic_id = ? AND a.erased_at IS NULL
  ORDER BY a.last_name, a.first_name`;

function toSummary(r: RosterRow): AthleteSummary {
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
  /** The clinic's roster, read as one prepared statement (the roster is read far more often than written). */
  rosterReader(db: Knex): (clinicId: number, nowIso: string) => Promise<AthleteSummary[]> {
    const read = preparedRead<RosterRow>(db, ROSTER_SQL);
    return async (clinicId, nowIso) => (await read([nowIso, clinicId])).map(toSummary);
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
