/**
 * A quick check of an annotation save's body for the autosave path: one pass over the document
 * with plain comparisons, answering the body when it certainly fits {@link AnnotationsBody} (zod
 * would accept it unchanged but for the `gauges` default), and null otherwise. Null is never an
 * error: the caller then parses with zod, which decides and words the 422. So this check may be
 * stricter than the schema (it then costs a zod parse), never looser; a property test holds it to
 * that against zod itself (test/server/annotations-body-check.test.ts).
 */
import { ANNOTATION_LIMITS, EVENT_ORIGINS, GAIT_EVENT_KINDS, LANDMARK_ORIGINS, LANDMARKS } from '../../src/contracts/annotations';
import { SIDES } from '../../src/contracts/assessment';
import type { AnnotationsInput } from './annotations-schemas';

type Plain = Record<string, unknown>;

const TOP = new Set(['baseRevision', 'landmarks', 'events', 'scale', 'gauges']);
const ENTRY = new Set(['frame', 'side', 'points', 'source']);
const POINT_NAMES = new Set<string>(LANDMARKS);
const POINT = new Set(['x', 'y', 'origin', 'confidence']);
const EVENT = new Set(['frame', 'side', 'kind', 'origin']);
const SCALE = new Set(['frame', 'a', 'b', 'lengthM']);
const GAUGE = new Set(['id', 'frame', 'a', 'vertex', 'b']);
const XY = new Set(['x', 'y']);
const SIDE_SET = new Set<unknown>(SIDES);
const SOURCES = new Set<unknown>(['manual', 'tracked']);
const POINT_ORIGINS = new Set<unknown>(LANDMARK_ORIGINS);
const EVENT_KINDS = new Set<unknown>(GAIT_EVENT_KINDS);
const EVENT_ORIGIN_SET = new Set<unknown>(EVENT_ORIGINS);
const GAUGE_ID = /^[A-Za-z0-9_-]{1,40}$/;

/** Whether `v` is an object (not null, not an array) whose every own key is in `allowed`. */
function only(v: unknown, allowed: Set<string>): v is Plain {
  if (typeof v !== 'object' || v === null || Array.isArray(v)) return false;
  for (const k in v) if (!Object.hasOwn(v, k) || !allowed.has(k)) return false;
  return true;
}

const fraction = (v: unknown) => typeof v === 'number' && v >= 0 && v <= 1;
const frameNumber = (v: unknown) => Number.isSafeInteger(v) && (v as number) >= 0;
/** A point `{x, y}` inside the frame, nothing else. */
const framePoint = (v: unknown): v is { x: number; y: number } => only(v, XY) && fraction(v['x']) && fraction(v['y']);

function landmarkEntry(v: unknown): boolean {
  if (!only(v, ENTRY) || !frameNumber(v['frame']) || !SIDE_SET.has(v['side'])) return false;
  if (v['source'] !== undefined && !SOURCES.has(v['source'])) return false;
  const points = v['points'];
  if (!only(points, POINT_NAMES)) return false;
  for (const name in points) {
    const p = points[name];
    if (!only(p, POINT) || !fraction(p['x']) || !fraction(p['y'])) return false;
    if (p['origin'] !== undefined && !POINT_ORIGINS.has(p['origin'])) return false;
    if (p['confidence'] !== undefined && !fraction(p['confidence'])) return false;
  }
  return true;
}

const eventMark = (v: unknown) =>
  only(v, EVENT) &&
  frameNumber(v['frame']) &&
  SIDE_SET.has(v['side']) &&
  EVENT_KINDS.has(v['kind']) &&
  (v['origin'] === undefined || EVENT_ORIGIN_SET.has(v['origin']));

const samePoint = (a: { x: number; y: number }, b: { x: number; y: number }) => a.x === b.x && a.y === b.y;

function scaleBar(v: unknown): boolean {
  if (v === null) return true;
  if (!only(v, SCALE) || !frameNumber(v['frame']) || !framePoint(v['a']) || !framePoint(v['b']) || samePoint(v['a'], v['b'])) return false;
  const m = v['lengthM'];
  return typeof m === 'number' && m >= ANNOTATION_LIMITS.scaleLengthM.min && m <= ANNOTATION_LIMITS.scaleLengthM.max;
}

function gauge(v: unknown): boolean {
  if (!only(v, GAUGE) || typeof v['id'] !== 'string' || !GAUGE_ID.test(v['id']) || !frameNumber(v['frame'])) return false;
  const { a, vertex, b } = v;
  return framePoint(a) && framePoint(vertex) && framePoint(b) && !samePoint(a, vertex) && !samePoint(b, vertex);
}

/** Whether no two items of `list` give the same key. */
function unique<T>(list: T[], key: (item: T) => string | number): boolean {
  const seen = new Set<string | number>();
  for (const item of list) {
    const k = key(item);
    if (seen.has(k)) return false;
    seen.add(k);
  }
  return true;
}

/** The frame and side of an entry as one number (frames are whole and at least 0). */
const frameSide = (e: { frame: number; side: string }) => e.frame * 2 + (e.side === 'left' ? 0 : 1);

/**
 * The body as {@link AnnotationsBody} would give it (with `gauges` defaulting to none) when it
 * certainly fits; null when zod must decide.
 */
export function fitsAnnotationsBody(body: unknown): AnnotationsInput | null {
  if (!only(body, TOP) || !('scale' in body)) return null;
  const { baseRevision, landmarks, events, scale, gauges = [] } = body;
  if (!frameNumber(baseRevision) || !scaleBar(scale)) return null;
  if (!Array.isArray(landmarks) || landmarks.length > ANNOTATION_LIMITS.landmarkFrames * 2 || !landmarks.every(landmarkEntry)) return null;
  if (!Array.isArray(events) || events.length > ANNOTATION_LIMITS.events || !events.every(eventMark)) return null;
  if (!Array.isArray(gauges) || gauges.length > ANNOTATION_LIMITS.gauges || !gauges.every(gauge)) return null;
  const input = { ...body, gauges } as AnnotationsInput;
  if (!unique(input.landmarks, frameSide) || !unique(input.events, frameSide) || !unique(input.gauges, (g) => g.id)) return null;
  return input;
}
