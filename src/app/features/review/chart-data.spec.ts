import type { AngleSample } from '../../../contracts/measures';
import {
  EVENT_DASH,
  EVENT_KEY,
  MARKER_LABEL_GAP_PX,
  angleDatasets,
  eventMarkersPlugin,
  frameFromChartValue,
  markerLabel,
  staggerLabels,
} from './chart-data';

const samples: AngleSample[] = [
  { frame: 10, timeMs: 83, side: 'left', thighDeg: 26.5651, kneeFlexionDeg: 12.5, trunkDeg: 11.3 },
  { frame: 4, timeMs: 33, side: 'left', thighDeg: -22.52 },
  { frame: 6, timeMs: 50, side: 'right', thighDeg: 5 },
];

describe('angleDatasets', () => {
  it('makes one dataset per chosen series and side, in frame order, rounded to 0.1°', () => {
    const sets = angleDatasets(samples, ['thigh', 'knee'], ['left', 'right']);
    expect(sets.map((s) => s.label)).toEqual(['Thigh · Left', 'Thigh · Right', 'Knee flexion · Left']);
    expect(sets[0].data).toEqual([
      { x: 4, y: -22.5 },
      { x: 10, y: 26.6 },
    ]);
  });

  it('colours sides violet and amber, trunk slate, and gives series their own dash', () => {
    const sets = angleDatasets(samples, ['thigh', 'knee', 'trunk'], ['left']);
    expect(sets.map((s) => s.borderColor)).toEqual(['#7B4FD6', '#7B4FD6', '#3E4C59']);
    expect(sets[0].borderDash).toEqual([]);
    expect(sets[1].borderDash).not.toEqual([]);
  });

  it('leaves out sides and series without values', () => {
    expect(angleDatasets(samples, ['foot'], ['left', 'right'])).toEqual([]);
  });
});

describe('frameFromChartValue', () => {
  it('rounds to a frame inside the clip', () => {
    expect(frameFromChartValue(4.6, 100)).toBe(5);
    expect(frameFromChartValue(-3, 100)).toBe(0);
    expect(frameFromChartValue(150, 100)).toBe(99);
    expect(frameFromChartValue(undefined, 100)).toBeNull();
  });
});

describe('eventMarkersPlugin', () => {
  it('draws a line per visible event and one for the current frame', () => {
    const calls: string[] = [];
    const ctx = new Proxy(
      {},
      {
        get: (_t, prop) =>
          prop === 'measureText'
            ? (text: string) => ({ width: text.length * 6 })
            : prop in { save: 1, restore: 1, beginPath: 1, rect: 1, clip: 1, moveTo: 1, lineTo: 1, stroke: 1, fillText: 1, setLineDash: 1 }
              ? (...args: unknown[]) => calls.push(`${String(prop)}:${args.join(',')}`)
              : undefined,
        set: () => true,
      },
    );
    const chart = {
      ctx,
      chartArea: { left: 0, right: 100, top: 10, bottom: 90 },
      scales: { x: { getPixelForValue: (v: number) => v } },
    };
    const plugin = eventMarkersPlugin({
      events: [
        { frame: 20, side: 'left', kind: 'initial_contact' },
        { frame: 500, side: 'right', kind: 'toe_off' },
      ],
      currentFrame: 50,
      currentColour: '#000',
      font: '12px sans-serif',
    });
    (plugin.afterDatasetsDraw as (c: unknown) => void)(chart);
    expect(calls.filter((c) => c.startsWith('stroke')).length).toBe(2);
    expect(calls).toContain('fillText:IC L,20,9');
    expect(calls).toContain('moveTo:50,10');
  });
});

describe('event labels on the chart', () => {
  it('abbreviates the event and side ("IC L", "TO R")', () => {
    expect(markerLabel({ frame: 1, side: 'left', kind: 'initial_contact' })).toBe('IC L');
    expect(markerLabel({ frame: 1, side: 'right', kind: 'toe_off' })).toBe('TO R');
  });

  it('leaves out every label when the lines stand closer than a label is wide (a long clip on a phone), keeping the lines', () => {
    // 24 px labels on lines 10 px apart: each label would sit over its neighbours' lines.
    const dense = Array.from({ length: 30 }, (_, i) => ({ x: i * 10, width: 24 }));
    expect(staggerLabels(dense, 2)).toEqual(dense.map(() => -1));
    // The old stagger put these three on two rows, each over the others' lines: none now.
    expect(
      staggerLabels(
        [
          { x: 0, width: 24 },
          { x: 10, width: 24 },
          { x: 20, width: 24 },
        ],
        2,
      ),
    ).toEqual([-1, -1, -1]);
  });

  it('staggers labels of lines a little apart over two rows, and keeps far ones on the first row', () => {
    // Lines 20 px apart: clear of each other's lines (> 12 + 1 px) but the labels would touch.
    expect(
      staggerLabels(
        [0, 20, 40, 60].map((x) => ({ x, width: 24 })),
        2,
      ),
    ).toEqual([0, 1, 0, 1]);
    // Far enough apart: all on the first row, whatever the input order.
    expect(
      staggerLabels(
        [
          { x: 100, width: 24 },
          { x: 0, width: 24 },
          { x: 50, width: 24 },
        ],
        2,
      ),
    ).toEqual([0, 0, 0]);
    // Two events on one frame share a line: both named, one above the other.
    expect(
      staggerLabels(
        [
          { x: 50, width: 24 },
          { x: 50, width: 24 },
          { x: 150, width: 24 },
        ],
        2,
      ),
    ).toEqual([0, 1, 0]);
    // A crowded stretch loses its labels; a lone line beside it keeps its own.
    expect(
      staggerLabels(
        [0, 8, 16, 80].map((x) => ({ x, width: 24 })),
        2,
      ),
    ).toEqual([-1, -1, -1, 0]);
  });

  it('never puts two labels of one row within 8 px of each other, nor a label over another line', () => {
    const spans = Array.from({ length: 40 }, (_, i) => ({ x: (i * 37) % 1200, width: 20 + (i % 3) * 5 }));
    const rows = staggerLabels(spans, 2);
    expect(rows.filter((r) => r >= 0).length).toBeGreaterThan(10);
    for (let i = 0; i < spans.length; i++) {
      if (rows[i] < 0) continue;
      for (let j = 0; j < spans.length; j++) {
        if (j === i || spans[j].x === spans[i].x) continue;
        expect(Math.abs(spans[j].x - spans[i].x)).toBeGreaterThan(spans[i].width / 2);
        if (rows[i] !== rows[j]) continue;
        const gap = Math.abs(spans[i].x - spans[j].x) - (spans[i].width + spans[j].width) / 2;
        expect(gap).toBeGreaterThanOrEqual(MARKER_LABEL_GAP_PX);
      }
    }
  });
});

describe('events key', () => {
  it('shows each kind with the dash its line is drawn with, so a chart too narrow for labels can still be read', () => {
    expect(EVENT_KEY.map((k) => k.short)).toEqual(['IC', 'MS', 'TO']);
    expect(EVENT_KEY.map((k) => k.dash)).toEqual(
      [EVENT_DASH.initial_contact, EVENT_DASH.midstance, EVENT_DASH.toe_off].map((d) => d.join(' ')),
    );
    expect(new Set(EVENT_KEY.map((k) => k.dash)).size).toBe(3);
  });
});
