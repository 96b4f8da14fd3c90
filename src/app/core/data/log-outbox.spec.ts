import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import type { LogEntry, LogWrite } from '../../../contracts/plans';
import { AuthStore } from '../auth-store';
import { LogOutbox, OUTBOX_CLOCK, OUTBOX_STORAGE } from './log-outbox';
import { logItem } from './log-outbox-queue';

const KEY = 'trailframe.log-outbox.v1.7';
const body = (key: string): LogWrite => ({
  key,
  stageId: 3,
  date: '2026-12-09',
  painDuring: 2,
  sets: [{ stageExerciseId: 11, setsDone: 3 }],
  note: 'ok',
});
const entry = (key: string): LogEntry => ({
  id: 40,
  planId: 5,
  stageId: 3,
  stageName: 'Holds',
  key,
  date: '2026-12-09',
  painDuring: 2,
  morningPain: null,
  morningAt: null,
  sets: [],
  note: 'ok',
  reviewNote: null,
  createdAt: '',
});

/** Lets the outbox's awaited requests and their follow-ups run. */
const settle = async () => {
  for (let i = 0; i < 10; i++) await Promise.resolve();
};

describe('LogOutbox', () => {
  let store: Map<string, string>;
  let now: number;
  let backend: HttpTestingController;

  function setup(): LogOutbox {
    TestBed.configureTestingModule({
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: AuthStore, useValue: { user: signal({ id: 7, athleteId: 3 }) } },
        {
          provide: OUTBOX_STORAGE,
          useValue: { getItem: (k: string) => store.get(k) ?? null, setItem: (k: string, v: string) => void store.set(k, v) },
        },
        { provide: OUTBOX_CLOCK, useValue: () => now },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    return TestBed.inject(LogOutbox);
  }

  beforeEach(() => {
    store = new Map();
    now = 1_000_000;
  });

  afterEach(() => backend.verify());

  it('keeps a session through a failed try and resends it with the same key, then forgets it', async () => {
    const outbox = setup();
    const delivered: string[] = [];
    outbox.delivered.subscribe(({ item }) => delivered.push(item.id));
    outbox.submitLog(5, body('key-one-1234'));
    expect(JSON.parse(store.get(KEY)!)).toHaveLength(1);

    const first = backend.expectOne('/api/plans/5/logs');
    expect(first.request.method).toBe('POST');
    first.error(new ProgressEvent('error'), { status: 0, statusText: 'Unknown Error' });
    await settle();
    expect(outbox.pending()).toHaveLength(1);
    expect(outbox.pending()[0]).toMatchObject({ attempts: 1, lastError: 'No connection. It will be sent when you are back online.' });
    expect(JSON.parse(store.get(KEY)!)[0].attempts).toBe(1);

    outbox.sendNow();
    const second = backend.expectOne('/api/plans/5/logs');
    expect(second.request.body).toEqual(body('key-one-1234'));
    second.flush(entry('key-one-1234'), { status: 200, statusText: 'OK' });
    await settle();
    expect(outbox.items()).toEqual([]);
    expect(JSON.parse(store.get(KEY)!)).toEqual([]);
    expect(delivered).toEqual(['key-one-1234']);
  });

  it('sends the morning check after its session, by the session key', async () => {
    const outbox = setup();
    outbox.submitLog(5, body('key-two-1234'));
    outbox.submitMorning(5, 'key-two-1234', 1, '2026-12-09');
    backend.expectOne('/api/plans/5/logs').flush(entry('key-two-1234'), { status: 201, statusText: 'Created' });
    await settle();
    const morning = backend.expectOne('/api/plans/5/logs/key-two-1234/morning');
    expect(morning.request.method).toBe('PUT');
    expect(morning.request.body).toEqual({ pain: 1 });
    morning.flush({ ...entry('key-two-1234'), morningPain: 1 });
    await settle();
    expect(outbox.items()).toEqual([]);
  });

  it('keeps a refused session with the reason until the athlete discards it (with its morning check)', async () => {
    const outbox = setup();
    // The page hears of each refusal, to read the plan again (the stage may have moved on).
    const refusals: string[] = [];
    outbox.refusals.subscribe((item) => refusals.push(item.id));
    outbox.submitLog(5, body('key-three-123'));
    outbox.submitMorning(5, 'key-three-123', 2, '2026-12-09');
    backend
      .expectOne('/api/plans/5/logs')
      .flush(
        { error: { code: 'stage_not_current', message: '“Holds” is not the current stage of this plan any more.' } },
        { status: 409, statusText: 'Conflict' },
      );
    await settle();
    // The morning check stays with its refused session: it is not sent (it would be refused too).
    backend.expectNone('/api/plans/5/logs/key-three-123/morning');
    expect(outbox.refused().map((i) => [i.id, i.lastError])).toEqual([
      ['key-three-123', '“Holds” is not the current stage of this plan any more.'],
    ]);
    expect(outbox.items().map((i) => i.id)).toEqual(['key-three-123', 'key-three-123:morning']);
    expect(refusals).toEqual(['key-three-123']);
    expect(JSON.parse(store.get(KEY)!)).toHaveLength(2);
    outbox.discard('key-three-123');
    expect(outbox.items()).toEqual([]);
  });

  it('sends a refused session again once the athlete fixed it, with the same key, then its morning check', async () => {
    const outbox = setup();
    outbox.submitLog(5, body('key-four-1234'));
    outbox.submitMorning(5, 'key-four-1234', 1, '2026-12-09');
    backend
      .expectOne('/api/plans/5/logs')
      .flush({ error: { code: 'stage_not_current', message: 'Stage moved on.' } }, { status: 409, statusText: 'Conflict' });
    await settle();
    outbox.resend('key-four-1234', { ...body('key-four-1234'), stageId: 4, sets: [{ stageExerciseId: 21, exerciseId: 101, setsDone: 3 }] });
    const again = backend.expectOne('/api/plans/5/logs');
    expect(again.request.body).toMatchObject({ key: 'key-four-1234', stageId: 4 });
    again.flush(entry('key-four-1234'), { status: 201, statusText: 'Created' });
    await settle();
    backend.expectOne('/api/plans/5/logs/key-four-1234/morning').flush(entry('key-four-1234'));
    await settle();
    expect(outbox.items()).toEqual([]);
  });

  it('picks up what an earlier page left in storage and sends it', async () => {
    store.set(KEY, JSON.stringify([logItem(5, body('key-left-1234'), 0)]));
    const outbox = setup();
    expect(outbox.pending()).toHaveLength(1);
    await settle();
    backend.expectOne('/api/plans/5/logs').flush(entry('key-left-1234'), { status: 201, statusText: 'Created' });
    await settle();
    expect(outbox.items()).toEqual([]);
  });
});
