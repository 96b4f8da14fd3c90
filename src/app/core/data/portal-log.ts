/**
 * The athlete's history as shown in the portal: the server's entries plus submissions still in
 * the outbox (shown as waiting or refused), newest first. Pure.
 */
import type { LogEntry, PlanStage } from '../../../contracts/plans';
import type { OutboxItem } from './log-outbox-queue';

export type HistoryRow =
  | { kind: 'sent'; key: string; entry: LogEntry; morningPending: number | null }
  | {
      kind: 'waiting' | 'refused';
      key: string;
      itemId: string;
      date: string;
      painDuring: number;
      note: string | null;
      stageName: string;
      message: string | null;
      setsDone: number;
      setsPrescribed: number;
    };

export function historyRows(logs: readonly LogEntry[], outbox: readonly OutboxItem[], stages: readonly PlanStage[]): HistoryRow[] {
  const rows: HistoryRow[] = [];
  const sentKeys = new Set(logs.map((l) => l.key));
  for (const item of outbox) {
    if (item.kind !== 'log' || sentKeys.has(item.key)) continue;
    const stage = stages.find((s) => s.id === item.body.stageId);
    const prescribed = stage?.exercises.reduce((n, e) => n + e.dose.sets, 0) ?? 0;
    rows.push({
      kind: item.refused ? 'refused' : 'waiting',
      key: item.key,
      itemId: item.id,
      date: item.body.date,
      painDuring: item.body.painDuring,
      note: item.body.note,
      stageName: stage?.name ?? '',
      message: item.lastError,
      setsDone: item.body.sets.reduce((n, s) => n + s.setsDone, 0),
      setsPrescribed: prescribed,
    });
  }
  for (const entry of logs) {
    const morning = outbox.find((i) => i.kind === 'morning' && i.key === entry.key && !i.refused);
    rows.push({ kind: 'sent', key: entry.key, entry, morningPending: morning && morning.kind === 'morning' ? morning.pain : null });
  }
  const dateOf = (r: HistoryRow) => (r.kind === 'sent' ? r.entry.date : r.date);
  return rows.sort((a, b) => (dateOf(a) === dateOf(b) ? (a.kind === 'sent' ? 1 : -1) : dateOf(a) < dateOf(b) ? 1 : -1));
}

/**
 * The sessions the morning check can be about: sent entries (with any answer still in the outbox
 * applied) and sessions still waiting to be sent.
 */
export function entriesForMorning(logs: readonly LogEntry[], outbox: readonly OutboxItem[]): LogEntry[] {
  const answered = new Map(outbox.filter((i) => i.kind === 'morning').map((i) => [i.key, i.kind === 'morning' ? i.pain : null]));
  const sent = logs.map((l) => (answered.has(l.key) ? { ...l, morningPain: answered.get(l.key) ?? l.morningPain } : l));
  const sentKeys = new Set(logs.map((l) => l.key));
  const waiting = outbox
    .filter((i) => i.kind === 'log' && !i.refused && !sentKeys.has(i.key))
    .map((i): LogEntry | null =>
      i.kind === 'log'
        ? {
            id: -1,
            planId: i.planId,
            stageId: i.body.stageId,
            stageName: '',
            key: i.key,
            date: i.body.date,
            painDuring: i.body.painDuring,
            morningPain: answered.get(i.key) ?? null,
            morningAt: null,
            sets: [],
            note: i.body.note,
            reviewNote: null,
            createdAt: '',
          }
        : null,
    )
    .filter((x): x is LogEntry => x !== null);
  return [...waiting, ...sent];
}

/**
 * The session logged for `day` — sent, or saved on the phone and waiting to send (not one the
 * server refused) — newest first, or null: what makes the portal say "Done for today".
 */
export function sessionLoggedOn(rows: readonly HistoryRow[], day: string): HistoryRow | null {
  return rows.find((r) => r.kind !== 'refused' && (r.kind === 'sent' ? r.entry.date : r.date) === day) ?? null;
}
