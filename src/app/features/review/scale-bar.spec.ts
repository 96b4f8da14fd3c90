import { lengthBasisText, mmPerPx, readScaleLength, scaleLengthPx } from './scale-bar';

describe('scale bar', () => {
  it('measures the line in frame pixels and gives mm per pixel', () => {
    // [calc] REFERENCES.md: 1 m spanning 400 px → 2.5 mm/px.
    const frame = { width: 1000, height: 500 };
    expect(scaleLengthPx({ x: 0.1, y: 0.5 }, { x: 0.5, y: 0.5 }, frame)).toBeCloseTo(400);
    expect(mmPerPx({ x: 0.1, y: 0.5 }, { x: 0.5, y: 0.5 }, 1, frame)).toBeCloseTo(2.5);
    // A diagonal: 300 px across and 400 px down on a square frame is 500 px.
    expect(scaleLengthPx({ x: 0, y: 0 }, { x: 0.3, y: 0.4 }, { width: 1000, height: 1000 })).toBeCloseTo(500);
    expect(mmPerPx({ x: 0.2, y: 0.2 }, { x: 0.2, y: 0.2 }, 1, frame)).toBeNull();
  });

  it('reads lengths between 0.05 and 10 m', () => {
    expect(readScaleLength('1')).toEqual({ value: 1 });
    expect(readScaleLength(' 0,5 ')).toEqual({ value: 0.5 });
    expect(readScaleLength('.25')).toEqual({ value: 0.25 });
    expect(readScaleLength('')).toEqual({ error: 'Enter the length in metres' });
    expect(readScaleLength('abc')).toHaveProperty('error');
    expect(readScaleLength('0.01')).toEqual({ error: 'Between 0.05 and 10 m' });
    expect(readScaleLength('12')).toEqual({ error: 'Between 0.05 and 10 m' });
  });

  it('says what lengths rest on for treadmill and overground clips', () => {
    expect(lengthBasisText('treadmill', 3)).toContain('belt speed (3.00 m/s)');
    expect(lengthBasisText('treadmill', null)).toContain('no belt speed is recorded');
    expect(lengthBasisText('track', null)).toContain('scale bar and how far the hip travels');
  });
});
