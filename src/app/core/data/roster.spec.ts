import type { AthleteSummary } from '../../../contracts/api';
import { accountState, rosterMatches, sortRoster } from './roster';

function athlete(overrides: Partial<AthleteSummary>): AthleteSummary {
  return {
    id: 1,
    firstName: 'Ada',
    lastName: 'Example',
    email: null,
    dateOfBirth: null,
    goalEvent: null,
    goalDate: null,
    coachId: null,
    coachName: null,
    hasAccount: false,
    invitationPending: false,
    videoConsent: false,
    maxPain: null,
    createdAt: '2025-01-01T00:00:00Z',
    updatedAt: '2025-01-01T00:00:00Z',
    ...overrides,
  };
}

describe('rosterMatches', () => {
  const row = athlete({
    firstName: 'José',
    lastName: 'Trailwalker',
    email: 'jose@runner.test',
    goalEvent: 'Mountain 50 km',
    coachName: 'Robin Coach',
  });

  it('matches everyone on an empty or blank query', () => {
    expect(rosterMatches(row, '')).toBe(true);
    expect(rosterMatches(row, '   ')).toBe(true);
  });

  it('matches names, e-mail, goal event and coach, ignoring case and accents', () => {
    expect(rosterMatches(row, 'jose')).toBe(true);
    expect(rosterMatches(row, 'TRAILW')).toBe(true);
    expect(rosterMatches(row, 'runner.test')).toBe(true);
    expect(rosterMatches(row, 'mountain')).toBe(true);
    expect(rosterMatches(row, 'robin')).toBe(true);
  });

  it('needs every word to match, in any field and any order', () => {
    expect(rosterMatches(row, 'trailwalker josé')).toBe(true);
    expect(rosterMatches(row, 'jose robin')).toBe(true);
    expect(rosterMatches(row, 'jose marathon')).toBe(false);
  });

  it('copes with missing optional fields', () => {
    expect(rosterMatches(athlete({}), 'coach')).toBe(false);
  });
});

describe('accountState', () => {
  it('prefers Active over a pending invitation', () => {
    expect(accountState({ hasAccount: true, invitationPending: true })).toBe('active');
    expect(accountState({ hasAccount: false, invitationPending: true })).toBe('invited');
    expect(accountState({ hasAccount: false, invitationPending: false })).toBe('none');
  });
});

describe('sortRoster', () => {
  const rows = [
    athlete({ id: 1, firstName: 'Cleo', lastName: 'Bright', maxPain: 3, goalDate: '2026-05-01' }),
    athlete({ id: 2, firstName: 'Abel', lastName: 'Able', maxPain: null, goalDate: null }),
    athlete({ id: 3, firstName: 'Bea', lastName: 'Crane', maxPain: 7, goalDate: '2025-10-01' }),
  ];
  const ids = (sorted: AthleteSummary[]) => sorted.map((a) => a.id);

  it('sorts by last name, then first name', () => {
    expect(ids(sortRoster(rows, { active: 'name', direction: 'asc' }))).toEqual([2, 1, 3]);
    expect(ids(sortRoster(rows, { active: 'name', direction: 'desc' }))).toEqual([3, 1, 2]);
  });

  it('keeps missing values last in both directions', () => {
    expect(ids(sortRoster(rows, { active: 'pain', direction: 'asc' }))).toEqual([1, 3, 2]);
    expect(ids(sortRoster(rows, { active: 'pain', direction: 'desc' }))).toEqual([3, 1, 2]);
    expect(ids(sortRoster(rows, { active: 'goal', direction: 'asc' }))).toEqual([3, 1, 2]);
  });

  it('orders names as English readers do (Unicode collation, en): accents and case second, Ø among the O\'s, digits as numbers', () => {
    const names = [
      athlete({ id: 1, lastName: 'Zeller', firstName: 'Ida' }),
      athlete({ id: 2, lastName: 'Øberg', firstName: 'Liv' }),
      athlete({ id: 3, lastName: 'Ochoa', firstName: 'Ana' }),
      athlete({ id: 4, lastName: 'Ångström', firstName: 'Per' }),
      athlete({ id: 5, lastName: 'de Vries', firstName: 'Noor' }),
      athlete({ id: 6, lastName: 'Runner 10', firstName: 'A' }),
      athlete({ id: 7, lastName: 'Runner 9', firstName: 'A' }),
      athlete({ id: 8, lastName: 'Ochoa', firstName: 'A\u0301lvaro' }),
    ];
    // Expected order worked out by hand from the Unicode Collation Algorithm's base letters (from memory).
    expect(ids(sortRoster(names, { active: 'name', direction: 'asc' }, 'en'))).toEqual([4, 5, 2, 8, 3, 7, 6, 1]);
    expect(ids(sortRoster(names, { active: 'name', direction: 'desc' }, 'en'))).toEqual([1, 6, 7, 3, 8, 2, 5, 4]);
  });

  it('leaves the order alone without a direction and never mutates the input', () => {
    const copy = [...rows];
    expect(ids(sortRoster(rows, { active: 'pain', direction: '' }))).toEqual([1, 2, 3]);
    sortRoster(rows, { active: 'name', direction: 'asc' });
    expect(rows).toEqual(copy);
  });
});
