import type { AngleSample } from '../../../contracts/measures';
import { angleDatasets, eventMarkersPlugin, frameFromChartValue, markerLabel, staggerLabels } from './chart-data';

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

  it('staggers labels that would overlap into the next row, and leaves out what does not fit', () => {
    // Three 24 px labels 10 px apart: the second goes up a row; the third still overlaps the first
    // (which ends at x = 12) and the second, so with two rows it is left out.
    expect(
      staggerLabels(
        [
          { x: 0, width: 24 },
          { x: 10, width: 24 },
          { x: 20, width: 24 },
        ],
        2,
      ),
    ).toEqual([0, 1, -1]);
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
    expect(
      staggerLabels(
        [
          { x: 0, width: 24 },
          { x: 10, width: 24 },
          { x: 40, width: 24 },
        ],
        2,
      ),
    ).toEqual([0, 1, 0]);
  });

  it('never puts two labels of one row over each other', () => {
    const spans = Array.from({ length: 40 }, (_, i) => ({ x: (i * 37) % 300, width: 20 + (i % 3) * 5 }));
    const rows = staggerLabels(spans, 2);
    for (let i = 0; i < spans.length; i++)
      for (let j = i + 1; j < spans.length; j++) {
        if (rows[i] < 0 || rows[i] !== rows[j]) continue;
        const gap = Math.abs(spans[i].x - spans[j].x) - (spans[i].width + spans[j].width) / 2;
        expect(gap).toBeGreaterThanOrEqual(4);
      }
  });
});
