import type { AngleSample } from '../../../contracts/measures';
import { angleDatasets, eventMarkersPlugin, frameFromChartValue } from './chart-data';

const samples: AngleSample[] = [
  { frame: 10, timeMs: 83, side: 'left', thighDeg: 26.5651, kneeFlexionDeg: 12.5, trunkDeg: 11.3 },
  { frame: 4, timeMs: 33, side: 'left', thighDeg: -22.52 },
  { frame: 6, timeMs: 50, side: 'right', thighDeg: 5 },
];

describe('angleDatasets', () => {
  it('makes one dataset per chosen series and side, in frame order, rounded to 0.1°', () => {
    const sets = angleDatasets(samples, ['thigh', 'knee'], ['left', 'right']);
    expect(sets.map((s) => s.label)).toEqual([
      'Thigh · Left',
      'Thigh · Right',
      'Knee flexion · Left',
    ]);
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
        get: (_t, prop) => (prop in { save: 1, restore: 1, beginPath: 1, rect: 1, clip: 1, moveTo: 1, lineTo: 1, stroke: 1, fillText: 1, setLineDash: 1 } ? (...args: unknown[]) => calls.push(`${String(prop)}:${args.join(',')}`) : undefined),
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
    expect(calls).toContain('fillText:ICL,20,9');
    expect(calls).toContain('moveTo:50,10');
  });
});
