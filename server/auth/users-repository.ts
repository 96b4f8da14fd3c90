import type { Knex } from 'knex';
import type { SessionUser, StaffMember } from '../../src/contracts/api';
import type { UserRow } from '../db/rows';
import { preparedRead } from '../db/prepared-read';
import { identityCache } from '../db/identity-cache';
import { byName } from '../db/name-order';

interface SessionUserRow {
  id: number;
  email: string;
  name: string;
  role: SessionUser['role'];
  clinic_id: number;
  clinic_name: string;
  athlete_id: number | null;
}

const SESSION_USER_SQL = `SELECT u.id, u.email, u.name, u.role, u.clinic_id, c.name AS clinic_name, a.id AS athlete_id
  FROM users u JOIN clinics c ON c.id = u.clinic_id LEFT JOIN athletes a ON a.user_id = u.id
  WHERE u.id = ? AND u.active`;

/** Rows of a `knex.raw` read, whatever the driver answers (an array, or `{ rows }`). */
const rawRows = <Row>(r: unknown): Row[] => (Array.isArray(r) ? r : (r as { rows: Row[] }).rows) as Row[];

function toSessionUser(row: SessionUserRow): SessionUser {
  return {
    id: row.id,
    email: row.email,
    name: row.name,
    role: row.role,
    clinicId: row.clinic_id,
    clinicName: row.clinic_name,
    athleteId: row.athlete_id ?? null,
  };
}

/** Reads and writes `users`. Every method takes a knex instance or a transaction. */
export const usersRepository = {
  findByEmail(db: Knex, email: string): Promise<UserRow | undefined> {
    return db<UserRow>('users').whereRaw('lower(email) = ?', [email.trim().toLowerCase()]).first();
  },

  findById(db: Knex, id: number): Promise<UserRow | undefined> {
    return db<UserRow>('users').where({ id }).first();
  },

  /** The session view of an active user, with clinic name and (for athletes) their athlete id. */
  async sessionUser(db: Knex, id: number): Promise<SessionUser | null> {
    const [row] = await db.raw<SessionUserRow[]>(SESSION_USER_SQL, [id]).then(rawRows<SessionUserRow>);
    return row ? toSessionUser(row) : null;
  },

  /**
   * {@link usersRepository.sessionUser} as a prepared read, for the lookup every signed-in request
   * makes (outside transactions only); rows are kept until the identity tables change
   * ({@link identityCache}), and each call answers its own copy.
   */
  sessionUserReader(db: Knex): (id: number) => Promise<SessionUser | null> {
    const read = preparedRead<SessionUserRow>(db, SESSION_USER_SQL);
    const rows = identityCache<number, SessionUserRow | undefined>(db);
    return async (id) => {
      const row = await rows.read(id, async () => (await read([id]))[0]);
      return row ? toSessionUser(row) : null;
    };
  },

  async insert(db: Knex, user: Omit<UserRow, 'id'>): Promise<number> {
    const [row] = await db('users').insert(user).returning('id');
    return typeof row === 'object' ? (row as { id: number }).id : (row as number);
  },

  async setPassword(db: Knex, id: number, passwordHash: string, at: string): Promise<void> {
    await db('users').where({ id }).update({ password_hash: passwordHash, updated_at: at });
  },

  /** Sets the password only while the stored hash is still `expected`; answers whether it did. */
  async replacePassword(db: Knex, id: number, expected: string | null, passwordHash: string, at: string): Promise<boolean> {
    const updated = await db('users').where({ id, password_hash: expected }).update({ password_hash: passwordHash, updated_at: at });
    return updated > 0;
  },

  async touchSignIn(db: Knex, id: number, at: string): Promise<void> {
    await db('users').where({ id }).update({ last_sign_in_at: at });
  },

  /** The clinic's owners and coaches (one when `id` is given), with how many athletes each coaches. */
  async listStaff(db: Knex, clinicId: number, id?: number): Promise<StaffMember[]> {
    const athleteCount = db('athletes as a').count('*').where('a.coach_id', db.ref('u.id')).as('athlete_count');
    const rows = await db('users as u')
      .where('u.clinic_id', clinicId)
      .whereIn('u.role', ['owner', 'coach'])
      .modify((q) => (id === undefined ? q : q.andWhere('u.id', id)))
      .orderBy('u.id')
      .select<(UserRow & { athlete_count: number })[]>('u.*', athleteCount);
    // Owners first, then by name ({@link byName}).
    rows.sort((a, b) => Number(b.role === 'owner') - Number(a.role === 'owner') || byName(a.name, b.name) || a.id - b.id);
    return rows.map((r) => ({
      id: r.id,
      email: r.email,
      name: r.name,
      role: r.role,
      active: Boolean(r.active),
      deactivatedAt: r.deactivated_at ?? null,
      athleteCount: Number(r.athlete_count),
      createdAt: r.created_at,
    }));
  },

  /** Active owners and coaches for assignment pickers, in alphabetical order ({@link byName}). */
  async listCoaches(db: Knex, clinicId: number): Promise<{ id: number; name: string }[]> {
    const rows: { id: number; name: string }[] = await db('users')
      .where({ clinic_id: clinicId, active: true })
      .whereIn('role', ['owner', 'coach'])
      .orderBy('id')
      .select('id', 'name');
    return rows.sort((a, b) => byName(a.name, b.name) || a.id - b.id);
  },
};
