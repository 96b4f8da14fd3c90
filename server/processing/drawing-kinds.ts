import type { Config } from '../config';
import { RENDER_ANNOTATED_CLIP } from '../annotated-clips/render-annotated-clip-kind';
import { FOLLOW_MARKERS } from '../follow/follow-kind';
import { EXPORT_ATHLETE_DATA } from '../privacy/export-kind';
import { RENDER_STILL } from '../stills/render-still-kind';
import { RENDER_SUMMARY } from '../summaries/render-summary-kind';
import type { KindFilter } from './processed-items-repository';

/**
 * The kinds that draw: they load Skia (@napi-rs/canvas) or pdfkit (server/render), whose code and
 * caches stay in a process once it has drawn. Stills, visit summaries, annotated clips, and data
 * exports (they print receipts); with them marker following, whose OpenCV WebAssembly build keeps
 * its module and heap in a process once loaded.
 */
export const DRAWING_KINDS: readonly string[] = [RENDER_STILL, RENDER_SUMMARY, RENDER_ANNOTATED_CLIP, EXPORT_ATHLETE_DATA, FOLLOW_MARKERS];

/**
 * The kinds the web process's own worker takes: every kind but the drawing ones when `DRAW_APART`
 * is on (a worker process takes those: `npm start` runs one), else every kind. On PostgreSQL
 * (pg-boss offers every item to every worker) the split does not apply.
 */
export function inProcessKinds(config: Pick<Config, 'drawApart' | 'databaseUrl'>): KindFilter | undefined {
  return config.drawApart && !config.databaseUrl ? { except: DRAWING_KINDS } : undefined;
}

/** The kinds a worker process (server/worker.ts) takes: only the drawing ones with `WORKER_KINDS=drawing` (SQLite), else every kind. */
export function workerProcessKinds(config: Pick<Config, 'workerKinds' | 'databaseUrl'>): KindFilter | undefined {
  return config.workerKinds === 'drawing' && !config.databaseUrl ? { only: DRAWING_KINDS } : undefined;
}

/** Whether `npm start` runs the drawing kinds in a worker process of their own beside the web server. */
export function drawsApart(config: Pick<Config, 'drawApart' | 'databaseUrl' | 'runWorker'>): boolean {
  return config.runWorker && inProcessKinds(config) !== undefined;
}
