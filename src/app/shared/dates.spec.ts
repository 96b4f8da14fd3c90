import { ageOn, parseIsoDate, toIsoDate, toIsoMonth } from './dates';

describe('toIsoDate / parseIsoDate', () => {
  it('round-trips calendar dates without shifting by a day', () => {
    const date = new Date(1990, 0, 31);
    expect(toIsoDate(date)).toBe('1990-01-31');
    expect(parseIsoDate('1990-01-31')?.getTime()).toBe(date.getTime());
  });

  it('pads months and days', () => {
    expect(toIsoDate(new Date(2024, 2, 5))).toBe('2024-03-05');
    expect(toIsoMonth(new Date(2024, 2, 5))).toBe('2024-03');
  });

  it('rejects impossible and malformed dates', () => {
    expect(parseIsoDate('2023-02-29')).toBeNull();
    expect(parseIsoDate('2024-13-01')).toBeNull();
    expect(parseIsoDate('31/01/1990')).toBeNull();
    expect(parseIsoDate(null)).toBeNull();
    expect(toIsoDate(new Date('nonsense'))).toBeNull();
    expect(toIsoDate(null)).toBeNull();
  });
});

describe('ageOn', () => {
  const on = (y: number, m: number, d: number) => new Date(y, m - 1, d);

  it('counts whole years, turning over on the birthday', () => {
    expect(ageOn('1990-06-15', on(2025, 6, 14))).toBe(34);
    expect(ageOn('1990-06-15', on(2025, 6, 15))).toBe(35);
    expect(ageOn('1990-06-15', on(2025, 12, 31))).toBe(35);
  });

  it('treats a 29 February birthday as reached on 1 March in common years', () => {
    expect(ageOn('2004-02-29', on(2025, 2, 28))).toBe(20);
    expect(ageOn('2004-02-29', on(2025, 3, 1))).toBe(21);
    expect(ageOn('2004-02-29', on(2028, 2, 29))).toBe(24);
  });

  it('gives null for missing, invalid or future birth dates', () => {
    expect(ageOn(null, on(2025, 1, 1))).toBeNull();
    expect(ageOn('not a date', on(2025, 1, 1))).toBeNull();
    expect(ageOn('2030-01-01', on(2025, 1, 1))).toBeNull();
  });

  it('is 0 in the first year', () => {
    expect(ageOn('2025-01-01', on(2025, 6, 1))).toBe(0);
  });
});
