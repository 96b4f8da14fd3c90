/**
 * Benchmark: the visit summary PDF with six annotated stills (1280×720 frames rendered to PNG
 * beforehand, as the still jobs leave them), the measures table of a fully marked clip, findings
 * and plan. Target ≤ 2 s. Side by side in the same run: the same PDF without stills, so the cost of
 * embedding the images is visible. Prints numbers only.
 *
 *   npx tsx test/bench/summary-pdf.ts [--runs 8]
 */
import { parseArgs } from 'node:util';
import { performance } from 'node:perf_hooks';
import { renderStill } from '../../server/render/still-render';
import { SUMMARY_CAUTION, renderSummaryPdf, type SummaryDocument } from '../../server/render/summary-pdf';
import { computeClipMeasures, DEFAULT_REFERENCE_BANDS } from '../../src/kinematics';
import { buildGroundTruth } from '../../scripts/demo-clip/ground-truth';
import type { FrameLandmarks, GaitEventMark } from '../../src/contracts/annotations';
import { H, W, frameJpeg, median, runnerPanel } from './support/still-inputs';

const { values: args } = parseArgs({ options: { runs: { type: 'string', default: '8' } } });
const RUNS = Number(args.runs);
const TARGET_MS = 2000;

const stills = [];
for (let i = 0; i < 6; i++) {
  const out = await renderStill({
    panels: [runnerPanel(await frameJpeg(i + 1))],
    caption: `Still ${i + 1}: right toe-off, hip extension and knee angle marked.`,
    showAngles: true,
  });
  stills.push({ image: out.png, width: out.width, height: out.height, caption: '' });
}

// Measures of a fully marked synthetic clip (2 s at 120 fps).
const truth = buildGroundTruth({ fps: 120, width: W, height: H, seconds: 2, hipExtensionDeg: 8, facing: 'right', beltSpeedMps: 3 });
const landmarks: FrameLandmarks[] = truth.frames.flatMap((f) => [
  { frame: f.index, side: 'right' as const, points: f.landmarksNormalised.near },
  { frame: f.index, side: 'left' as const, points: f.landmarksNormalised.far },
]);
const events: GaitEventMark[] = [
  ...truth.events.near.initialContact.map((frame) => ({ frame, side: 'right' as const, kind: 'initial_contact' as const })),
  ...truth.events.near.toeOff.map((frame) => ({ frame, side: 'right' as const, kind: 'toe_off' as const })),
];
const measures = computeClipMeasures({
  clipId: 1,
  annotations: { landmarks, events, scale: null },
  frameSize: { width: W, height: H },
  fps: 120,
  direction: 'left_to_right',
  surface: 'treadmill',
  beltSpeedMps: 3,
  bands: DEFAULT_REFERENCE_BANDS,
  frameCount: truth.frameCount,
});

const base: SummaryDocument = {
  clinicName: 'Benchmark Clinic',
  athleteName: 'Bench Runner',
  title: 'Visit summary',
  issuedOn: '2 Dec 2026',
  coachName: 'Bench Coach',
  visits: [{ label: 'Re-test · 24 Nov 2026', surface: 'Treadmill', speed: '3.00 m/s (10.8 km/h)', incline: '1 %', shoes: null }],
  measures: [{ heading: 'Clip 1 of 1', measures: measures.measures }],
  comparison: null,
  stills,
  findings: 'Hip extension at toe-off has improved; the push-off is no longer cut short after the strain. '.repeat(4),
  planText: 'Stage 2 (eccentric): slow split-squat lowering, 3 × 8, three times a week; drills before easy runs. '.repeat(3),
  caution: SUMMARY_CAUTION,
};

const timeIt = async (doc: SummaryDocument) => {
  const t0 = performance.now();
  const out = await renderSummaryPdf(doc);
  return { ms: performance.now() - t0, bytes: out.pdf.length, pages: out.pageCount };
};

await timeIt(base);
const withStills: number[] = [];
const without: number[] = [];
let last = { bytes: 0, pages: 0 };
for (let i = 0; i < RUNS; i++) {
  const a = await timeIt(base);
  last = a;
  withStills.push(a.ms);
  without.push((await timeIt({ ...base, stills: [] })).ms);
}
const m = median(withStills);
console.log(
  `summary PDF: ${last.pages} pages, ${(last.bytes / 1024).toFixed(0)} KiB, 6 stills of ${W}×${H} (+ heading and caption), ${RUNS} runs each, interleaved`,
);
console.log(`with 6 stills:  median ${m.toFixed(0)} ms`);
console.log(`without stills: median ${median(without).toFixed(0)} ms`);
console.log(`ratio with / without: ${(m / median(without)).toFixed(2)}`);
console.log(`ratio median / target (${TARGET_MS} ms): ${(m / TARGET_MS).toFixed(2)} — ${m <= TARGET_MS ? 'met' : 'NOT met'}`);
