/**
 * Progression and pain-alert rules of Plans, as pure functions: no Angular, no Node, no I/O.
 * The server computes with them; the client shows their results (and may preview with them).
 */
export { addDays, dayOf, daysBetween, isIsoDate, weekStart } from './dates';
export {
  isSettled,
  painAlerts,
  weeklyMean,
  RECENT_DAYS,
  WEEKLY_RISE_MIN_POINTS,
  WEEKLY_RISE_MIN_SESSIONS,
  WEEKLY_RISE_RECENT_DAYS,
  type PainLog,
} from './pain-rule';
export {
  allSetsDone,
  checkCriterion,
  describeCriterion,
  evaluateProgression,
  newestFirst,
  type StageForProgression,
  type StageLog,
} from './progression';
export { sessionsPerWeek, weeklyAdherence, type StagePeriod } from './adherence';
