import type { AthleteSummary } from '../../../contracts/api';

/** Whether an athlete can sign in to Trailframe. */
export type AccountState = 'active' | 'invited' | 'none';

export const ACCOUNT_STATE_LABELS: Record<AccountState, string> = {
  active: 'Active',
  invited: 'Invited',
  none: 'No account',
};

export function accountState(a: Pick<AthleteSummary, 'hasAccount' | 'invitationPending'>): AccountState {
  if (a.hasAccount) return 'active';
  return a.invitationPending ? 'invited' : 'none';
}

export function fullName(a: Pick<AthleteSummary, 'firstName' | 'lastName'>): string {
  return `${a.firstName} ${a.lastName}`.trim();
}

/** Lower case without accents, so "jose" finds "José". */
export function foldText(text: string): string {
  return text.normalize('NFD').replace(/\p{M}/gu, '').toLowerCase();
}

/**
 * Roster filter: every word of `query` must appear in the athlete's name, e-mail, goal event or
 * coach name (case- and accent-insensitive). An empty query matches everyone.
 */
export function rosterMatches(a: AthleteSummary, query: string): boolean {
  const words = foldText(query).split(/\s+/).filter(Boolean);
  if (words.length === 0) return true;
  const haystack = foldText([a.firstName, a.lastName, a.email ?? '', a.goalEvent ?? '', a.coachName ?? ''].join(' '));
  return words.every((w) => haystack.includes(w));
}

/** Sortable roster columns. */
export type RosterColumn = 'name' | 'goal' | 'coach' | 'account' | 'consent' | 'pain' | 'updated';

export interface RosterSort {
  active: string;
  direction: 'asc' | 'desc' | '';
}

const ACCOUNT_ORDER: Record<AccountState, number> = { active: 0, invited: 1, none: 2 };

function sortKey(a: AthleteSummary, column: string): string | number | null {
  switch (column as RosterColumn) {
    case 'name':
      return `${a.lastName} ${a.firstName}`;
    case 'goal':
      return a.goalDate ?? null;
    case 'coach':
      return a.coachName || null;
    case 'account':
      return ACCOUNT_ORDER[accountState(a)];
    case 'consent':
      return a.videoConsent ? 1 : 0;
    case 'pain':
      return a.maxPain;
    case 'updated':
      return a.updatedAt;
    default:
      return null;
  }
}

/**
 * Sorts a copy of `rows` by a roster column. Names and coaches sort as the reader's language
 * orders them (`locale`; default the browser's): "Ångström" among the A's, "Øberg" among the
 * O's, case and accents second, digits as numbers. Missing values (no goal date, no coach, no
 * pain recorded) always go last; ties fall back to the name so the order is stable.
 */
export function sortRoster(rows: readonly AthleteSummary[], sort: RosterSort, locale?: string): AthleteSummary[] {
  const copy = [...rows];
  if (!sort.direction || !sort.active) return copy;
  const sign = sort.direction === 'asc' ? 1 : -1;
  const text = new Intl.Collator(locale, { numeric: true }).compare;
  const names = (x: AthleteSummary, y: AthleteSummary) => text(x.lastName, y.lastName) || text(x.firstName, y.firstName);
  return copy.sort((x, y) => {
    const a = sortKey(x, sort.active);
    const b = sortKey(y, sort.active);
    if (a === null && b !== null) return 1;
    if (b === null && a !== null) return -1;
    if (a !== null && b !== null && a !== b) {
      const order = sort.active === 'name' ? names(x, y) : typeof a === 'string' && typeof b === 'string' ? text(a, b) : a < b ? -1 : 1;
      if (order !== 0) return order * sign;
    }
    return names(x, y) || x.id - y.id;
  });
}
