import type { LogEntry, PlanStage } from '../../../contracts/plans';
import { logItem, morningItem, refuse } from './log-outbox-queue';
import { entriesForMorning, historyRows, sessionLoggedOn } from './portal-log';

const sent = (key: string, date: string, morningPain: number | null = null): LogEntry => ({
  id: 1,
  planId: 5,
  stageId: 3,
  stageName: 'Holds',
  key,
  date,
  painDuring: 2,
  morningPain,
  morningAt: null,
  sets: [],
  note: null,
  reviewNote: null,
  createdAt: '',
});
const stage = { id: 3, name: 'Holds', exercises: [{ dose: { sets: 3 } }, { dose: { sets: 2 } }] } as unknown as PlanStage;
const body = (key: string, date: string) => ({
  key,
  stageId: 3,
  date,
  painDuring: 4,
  sets: [{ stageExerciseId: 1, setsDone: 2 }],
  note: 'tight',
});

describe('portal log', () => {
  it('merges sent entries and queued ones, newest first; a queued copy of a sent entry shows once', () => {
    const outbox = [
      logItem(5, body('a', '2026-12-09'), 0),
      refuse([logItem(5, body('b', '2026-12-07'), 0)], 'b', 'Stage moved on')[0]!,
      logItem(5, body('c', '2026-12-08'), 0),
    ];
    const rows = historyRows([sent('c', '2026-12-08'), sent('d', '2026-12-05')], outbox, [stage]);
    expect(rows.map((r) => [r.key, r.kind])).toEqual([
      ['a', 'waiting'],
      ['c', 'sent'],
      ['b', 'refused'],
      ['d', 'sent'],
    ]);
    expect(rows[0]).toMatchObject({ stageName: 'Holds', setsDone: 2, setsPrescribed: 5, painDuring: 4 });
    expect(rows[2]).toMatchObject({ message: 'Stage moved on' });
  });

  it('applies queued morning answers, and offers waiting sessions to the morning check', () => {
    const outbox = [morningItem(5, 'c', 1, '2026-12-08', 0), logItem(5, body('a', '2026-12-09'), 0)];
    const entries = entriesForMorning([sent('c', '2026-12-08')], outbox);
    expect(entries.map((e) => [e.key, e.morningPain])).toEqual([
      ['a', null],
      ['c', 1],
    ]);
    expect(historyRows([sent('c', '2026-12-08')], outbox, [stage]).find((r) => r.key === 'c')).toMatchObject({
      kind: 'sent',
      morningPending: 1,
    });
  });

  it('finds the session logged for a day, sent or still waiting, but not one the server refused', () => {
    const today = '2026-12-09';
    const waiting = historyRows([sent('d', '2026-12-08')], [logItem(5, body('a', today), 0)], [stage]);
    expect(sessionLoggedOn(waiting, today)).toMatchObject({ key: 'a', kind: 'waiting' });
    expect(sessionLoggedOn(historyRows([sent('c', today)], [], [stage]), today)).toMatchObject({ key: 'c', kind: 'sent' });
    const refused = historyRows([], refuse([logItem(5, body('b', today), 0)], 'b', 'Stage moved on'), [stage]);
    expect(sessionLoggedOn(refused, today)).toBeNull();
    expect(sessionLoggedOn(historyRows([sent('d', '2026-12-08')], [], [stage]), today)).toBeNull();
  });
});
