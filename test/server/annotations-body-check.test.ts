/**
 * The autosave's quick body check (server/annotations/annotations-body-check.ts) against zod, the
 * independent judge: over documents that fit and documents with random changes (values swapped
 * for other JSON, keys added or dropped, edge numbers), the quick check passes a body exactly when
 * the zod schema AnnotationsBody accepts it, and then gives what zod gives.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { fitsAnnotationsBody } from '../../server/annotations/annotations-body-check';
import { AnnotationsBody } from '../../server/annotations/annotations-schemas';
import { EVENT_ORIGINS, GAIT_EVENT_KINDS, LANDMARK_ORIGINS, LANDMARKS } from '../../src/contracts/annotations';

const edge = fc.constantFrom(0, 1, -0, -1, 0.5, 1.0000001, -1e-9, 2, 0.05, 10, 10.5, 2 ** 53, 1.5, '', 'left', 'x', null, true, [], {});
/** Mostly a fitting value, now and then an edge or wrong one. */
const mostly = <T>(fits: fc.Arbitrary<T>) => fc.oneof({ arbitrary: fits, weight: 40 }, { arbitrary: edge, weight: 1 });
const fractionish = mostly(fc.double({ min: 0, max: 1, noNaN: true }));
const frame = mostly(fc.nat(100_000));
const side = fc.constantFrom('left', 'right');
const point = fc.record(
  {
    x: fractionish,
    y: fractionish,
    origin: mostly(fc.constantFrom(...LANDMARK_ORIGINS)),
    confidence: fractionish,
  },
  { requiredKeys: ['x', 'y'] },
);
const points = fc.record(Object.fromEntries(LANDMARKS.map((l) => [l, point])), { requiredKeys: [] });
const entry = fc.record(
  { frame, side, points, source: mostly(fc.constantFrom('manual', 'tracked')) },
  { requiredKeys: ['frame', 'side', 'points'] },
);
const event = fc.record(
  { frame, side, kind: fc.constantFrom(...GAIT_EVENT_KINDS), origin: fc.constantFrom(...EVENT_ORIGINS) },
  { requiredKeys: ['frame', 'side', 'kind'] },
);
const xy = fc.record({ x: fractionish, y: fractionish });
const scale = fc.option(fc.record({ frame, a: xy, b: xy, lengthM: mostly(fc.double({ min: 0.04, max: 10.1, noNaN: true })) }));
const gauge = fc.record({ id: mostly(fc.stringMatching(/^[A-Za-z0-9_-]{1,8}$/)), frame, a: xy, vertex: xy, b: xy });
const document = fc.record(
  {
    baseRevision: mostly(fc.nat(1000)),
    landmarks: fc.array(entry, { maxLength: 6 }),
    events: fc.array(event, { maxLength: 4 }),
    scale,
    gauges: fc.array(gauge, { maxLength: 3 }),
  },
  { requiredKeys: ['baseRevision', 'landmarks', 'events', 'scale'] },
);

/** A change somewhere in the document: a value replaced, a key dropped or a key added. */
const change = fc.record({
  path: fc.array(fc.nat(), { maxLength: 5 }),
  kind: fc.constantFrom('replace', 'drop', 'add'),
  value: fc.oneof(fc.jsonValue({ maxDepth: 2 }), edge),
});

function apply(doc: unknown, c: { path: number[]; kind: string; value: unknown }): void {
  let at = doc as Record<string, unknown>;
  for (let i = 0; ; i++) {
    const keys = Object.keys(at);
    if (!keys.length) return;
    const key = keys[c.path[i]! % keys.length] ?? keys[0]!;
    const next = at[key];
    if (i + 1 >= c.path.length || typeof next !== 'object' || next === null) {
      if (c.kind === 'replace') at[key] = c.value;
      else if (c.kind === 'drop' && !Array.isArray(at)) delete at[key];
      else if (!Array.isArray(at)) at[`extra${c.path.length}`] = c.value;
      return;
    }
    at = next as Record<string, unknown>;
  }
}

/** Bodies zod accepted so far (so the passing side is exercised too). */
let accepted = 0;

/** Both judges on one body: the quick check passes it exactly when zod accepts it, with zod's output. */
function agree(body: unknown): void {
  const quick = fitsAnnotationsBody(structuredClone(body));
  const judged = AnnotationsBody.safeParse(structuredClone(body));
  expect(quick !== null, JSON.stringify(body)).toBe(judged.success);
  if (quick) expect(quick).toEqual(judged.data);
  if (judged.success) accepted++;
}

describe('fitsAnnotationsBody against the zod schema', () => {
  it('documents as generated: passed exactly when zod accepts them, with the same output', () => {
    accepted = 0;
    fc.assert(fc.property(document, agree), { numRuns: 1000 });
    expect(accepted).toBeGreaterThan(50);
  });

  it('documents with up to three random changes: the same', () => {
    fc.assert(
      fc.property(document, fc.array(change, { minLength: 1, maxLength: 3 }), (doc, changes) => {
        for (const c of changes) apply(doc, c);
        agree(doc);
      }),
      { numRuns: 1500 },
    );
  });

  it('a coach’s document passes (points with and without origin, an event, a scale bar, a gauge); duplicates and a zero-length scale do not', () => {
    const doc = {
      baseRevision: 3,
      landmarks: [
        { frame: 2, side: 'right', points: { hip: { x: 0.5, y: 0.4 }, knee: { x: 0.5, y: 0.6, origin: 'followed', confidence: 0.7 } } },
        { frame: 2, side: 'left', points: { ankle: { x: 0, y: 1 } } },
      ],
      events: [{ frame: 2, side: 'right', kind: 'initial_contact' }],
      scale: { frame: 0, a: { x: 0.1, y: 0.9 }, b: { x: 0.6, y: 0.9 }, lengthM: 1 },
      gauges: [{ id: 'g1', frame: 2, a: { x: 0.1, y: 0.1 }, vertex: { x: 0.2, y: 0.2 }, b: { x: 0.3, y: 0.1 } }],
    };
    expect(fitsAnnotationsBody(structuredClone(doc))).toEqual(AnnotationsBody.parse(structuredClone(doc)));
    const { gauges: _, ...withoutGauges } = doc;
    expect(fitsAnnotationsBody(withoutGauges)?.gauges).toEqual([]);
    for (const bad of [
      { ...doc, landmarks: [doc.landmarks[0], doc.landmarks[0]] },
      { ...doc, events: [doc.events[0], doc.events[0]] },
      { ...doc, scale: { ...doc.scale, b: doc.scale.a } },
      { ...doc, gauges: [doc.gauges[0], doc.gauges[0]] },
    ]) {
      expect(fitsAnnotationsBody(bad)).toBeNull();
      expect(AnnotationsBody.safeParse(bad).success).toBe(false);
    }
  });
});
