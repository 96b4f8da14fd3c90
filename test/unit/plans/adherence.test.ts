import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { addDays, sessionsPerWeek, weeklyAdherence } from '../../../src/plans-rules';

describe('weekly adherence (sessions done vs prescribed)', () => {
  it('a stage asks for as many sessions a week as its most frequent exercise', () => {
    expect(sessionsPerWeek([{ daysPerWeek: 3 }, { daysPerWeek: 5 }])).toBe(5);
    expect(sessionsPerWeek([])).toBe(0);
  });

  it('counts sessions per Monday-to-Sunday week and pro-rates a partial first week', () => {
    // Stage 1 current from Thursday 2026-11-26 (4 of 7 days that week, 3 a week → 1.7 → 2),
    // stage 2 (4 a week) from Monday 2026-12-07 (the day after stage 1 ended).
    const weeks = weeklyAdherence(
      [
        { start: '2026-11-26', end: '2026-12-06', sessionsPerWeek: 3 },
        { start: '2026-12-07', end: null, sessionsPerWeek: 4 },
      ],
      ['2026-11-26', '2026-11-28', '2026-12-01', '2026-12-03', '2026-12-05', '2026-12-08'],
      '2026-12-09',
    );
    expect(weeks).toEqual([
      { weekStart: '2026-11-23', done: 2, prescribed: 2 },
      { weekStart: '2026-11-30', done: 3, prescribed: 3 },
      { weekStart: '2026-12-07', done: 1, prescribed: 4 },
    ]);
  });

  it('a stage change mid-week shares the week between the two stages', () => {
    const weeks = weeklyAdherence(
      [
        { start: '2026-11-30', end: '2026-12-02', sessionsPerWeek: 7 }, // 3 days → 3
        { start: '2026-12-03', end: null, sessionsPerWeek: 7 }, //       4 days → 4
      ],
      [],
      '2026-12-06',
    );
    expect(weeks).toEqual([{ weekStart: '2026-11-30', done: 0, prescribed: 7 }]);
  });

  it('has no weeks before anything started', () => {
    expect(weeklyAdherence([], [], '2026-12-09')).toEqual([]);
  });

  it('property: done sums to the number of sessions up to the last week', () => {
    const offsets = fc.array(fc.integer({ min: 0, max: 40 }), { maxLength: 30 });
    fc.assert(
      fc.property(offsets, fc.integer({ min: 1, max: 7 }), (days, perWeek) => {
        const start = '2026-10-01';
        const dates = days.map((d) => addDays(start, d));
        const weeks = weeklyAdherence([{ start, end: null, sessionsPerWeek: perWeek }], dates, addDays(start, 40));
        expect(weeks.reduce((s, w) => s + w.done, 0)).toBe(dates.length);
        for (const w of weeks.slice(1)) expect(w.prescribed).toBe(perWeek);
      }),
    );
  });
});
