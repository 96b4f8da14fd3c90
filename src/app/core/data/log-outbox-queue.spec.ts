import type { LogWrite } from '../../../contracts/plans';
import {
  BACKOFF,
  backoffMs,
  dueNow,
  enqueue,
  isRetryable,
  logItem,
  morningItem,
  nextDue,
  nextWake,
  parseStored,
  refuse,
  remove,
  resend,
  retargetLog,
  retryLater,
} from './log-outbox-queue';

const body = (key: string): LogWrite => ({ key, stageId: 3, date: '2026-12-09', painDuring: 2, sets: [], note: null });

describe('log outbox queue', () => {
  it('backs off 1 s, 2 s, 4 s … up to 60 s, with ±20 % jitter', () => {
    const mid = () => 0.5;
    expect([1, 2, 3, 4, 7, 20].map((n) => backoffMs(n, mid))).toEqual([1000, 2000, 4000, 8000, 60000, 60000]);
    expect(backoffMs(1, () => 0)).toBe(800);
    expect(backoffMs(1, () => 1)).toBe(1200);
    expect(backoffMs(50, () => 1)).toBe(BACKOFF.maxMs * 1.2);
  });

  it('retries only what a retry can fix', () => {
    expect([0, 408, 429, 500, 502, 503].every(isRetryable)).toBe(true);
    // Signed out (a password reset elsewhere, an expired session): kept and sent after signing in again.
    expect(isRetryable(401)).toBe(true);
    expect([400, 403, 404, 409, 422].some(isRetryable)).toBe(false);
  });

  it('sends in order, and a morning check only after its session went out', () => {
    let items = enqueue([], logItem(1, body('k1'), 0));
    items = enqueue(items, morningItem(1, 'k1', 2, '2026-12-09', 0));
    items = enqueue(items, logItem(1, body('k2'), 0));
    expect(nextDue(items, 0)?.id).toBe('k1');
    items = retryLater(items, 'k1', 'offline', 0, () => 0.5);
    // k1 waits 1 s; its morning check waits for it; k2 may go.
    expect(nextDue(items, 10)?.id).toBe('k2');
    items = remove(items, 'k2');
    expect(nextDue(items, 10)).toBeNull();
    expect(nextWake(items)).toBe(1000);
    items = remove(items, 'k1');
    expect(nextDue(items, 10)?.id).toBe('k1:morning');
  });

  it('keeps refused items, never sends them again, and wakes only for pending ones', () => {
    let items = enqueue([], logItem(1, body('k1'), 0));
    items = refuse(items, 'k1', 'Stage moved on');
    expect(items[0]).toMatchObject({ refused: true, lastError: 'Stage moved on', attempts: 1 });
    expect(nextDue(items, 10_000)).toBeNull();
    expect(nextWake(items)).toBeNull();
    // Its morning check stays with it (it would be refused too) until the session is fixed or discarded.
    items = enqueue(items, morningItem(1, 'k1', 1, '2026-12-09', 0));
    expect(nextDue(items, 0)).toBeNull();
    expect(nextDue(remove(items, 'k1'), 0)?.id).toBe('k1:morning');
  });

  it('a refused session fixed by the athlete goes out again with its key, its morning check after it', () => {
    let items = enqueue([], logItem(1, body('k1'), 0));
    items = enqueue(items, morningItem(1, 'k1', 1, '2026-12-09', 0));
    items = refuse(items, 'k1', 'Stage moved on');
    const fixed = { ...body('other-key'), stageId: 4 };
    items = resend(items, 'k1', fixed, 50);
    expect(items[0]).toMatchObject({ id: 'k1', refused: false, attempts: 0, lastError: null, nextAt: 50, body: { key: 'k1', stageId: 4 } });
    expect(nextDue(items, 50)?.id).toBe('k1');
    expect(nextDue(remove(items, 'k1'), 50)?.id).toBe('k1:morning');
    // Nothing else changes, and an unknown id changes nothing.
    expect(resend(items, 'nope', fixed, 60)).toEqual(items);
  });

  it('re-aims a session at another stage, matching sets by stage exercise or by library exercise', () => {
    const sent = {
      ...body('k1'),
      stageId: 3,
      sets: [
        { stageExerciseId: 11, exerciseId: 101, setsDone: 3 },
        { stageExerciseId: 12, exerciseId: 102, setsDone: 2 },
        { stageExerciseId: 13, setsDone: 1 },
      ],
    };
    const today = {
      id: 4,
      exercises: [
        { id: 21, exerciseId: 102 },
        { id: 11, exerciseId: 101 },
        { id: 22, exerciseId: 103 },
      ],
    };
    expect(retargetLog(sent, today)).toEqual({
      ...sent,
      stageId: 4,
      sets: [
        { stageExerciseId: 21, exerciseId: 102, setsDone: 2 },
        { stageExerciseId: 11, exerciseId: 101, setsDone: 3 },
        { stageExerciseId: 22, exerciseId: 103, setsDone: 0 },
      ],
    });
  });

  it('a changed morning answer replaces the queued one; "send now" makes everything due', () => {
    let items = enqueue([], morningItem(1, 'k1', 4, '2026-12-09', 0));
    items = enqueue(items, morningItem(1, 'k1', 2, '2026-12-09', 5));
    expect(items).toHaveLength(1);
    expect(items[0]).toMatchObject({ pain: 2 });
    items = retryLater(items, 'k1:morning', 'offline', 0, () => 0.5);
    expect(nextDue(items, 10)).toBeNull();
    expect(nextDue(dueNow(items, 10), 10)?.id).toBe('k1:morning');
  });

  it('reads back what it stored and survives anything else in storage', () => {
    const items = [logItem(1, body('k1'), 0), morningItem(1, 'k1', 2, '2026-12-09', 0)];
    expect(parseStored(JSON.stringify(items))).toEqual(items);
    expect(parseStored(null)).toEqual([]);
    expect(parseStored('{not json')).toEqual([]);
    expect(parseStored('{"a":1}')).toEqual([]);
    expect(parseStored(JSON.stringify([{ id: 'x' }, items[0]]))).toEqual([items[0]]);
  });
});
