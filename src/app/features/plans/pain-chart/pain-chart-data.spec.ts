import { painSeries, shortDate } from './pain-chart-data';

describe('pain chart data', () => {
  it('orders sessions by date and draws the rule as flat lines', () => {
    const s = painSeries(
      [
        { date: '2026-12-08', painDuring: 6, morningPain: null, stageId: 1 },
        { date: '2026-12-01', painDuring: 2, morningPain: 1, stageId: 1 },
      ],
      5,
      2,
    );
    expect(s).toEqual({ labels: ['1 Dec', '8 Dec'], during: [2, 6], morning: [1, null], limit: [5, 5], settled: [2, 2] });
    expect(shortDate('2027-01-31')).toBe('31 Jan');
  });
});
