import type { Measure, ReferenceBand } from '../../../contracts/measures';
import { DEFAULT_REFERENCE_BANDS } from './kinematics-adapter';
import { bandLine } from './measure-band';

// Heiderscheit et al. 2011 (REFERENCES.md, [pub]): knee flexion at initial contact 17.8 ± 4.0°,
// so a band of mean ± 1 SD is 13.8–21.8°.
const knee = DEFAULT_REFERENCE_BANDS.find((b) => b.key === 'knee_flexion_initial_contact')!;

function measure(partial: Partial<Measure>): Pick<Measure, 'key' | 'unit' | 'status' | 'band'> {
  return { key: 'knee_flexion_initial_contact', unit: '°', status: 'ok', ...partial };
}

describe('bandLine', () => {
  it('shows where the value sits with the band and its unit (13.8–21.8°, Heiderscheit et al. 2011)', () => {
    const line = bandLine(measure({ band: { band: knee, position: 'within' } }), [])!;
    expect(line.text).toBe('Within the reference band 13.8–21.8°');
    expect(line.icon).toBe('check');
    expect(line.outside).toBe(false);
    expect(line.source).toContain('Heiderscheit et al. 2011');
    expect(line.source).toContain('Published figure');
  });

  it('says below or above, outside the band', () => {
    expect(bandLine(measure({ band: { band: knee, position: 'below' } }), [])!).toMatchObject({
      text: 'Below the reference band 13.8–21.8°',
      outside: true,
      icon: 'south',
    });
    expect(bandLine(measure({ band: { band: knee, position: 'above' } }), [])!).toMatchObject({
      text: 'Above the reference band 13.8–21.8°',
      outside: true,
    });
  });

  it('still shows the band (without a verdict) when the measure has no value', () => {
    const line = bandLine(measure({ status: 'not_enough_data' }), DEFAULT_REFERENCE_BANDS)!;
    expect(line).toMatchObject({ icon: null, text: 'Reference band 13.8–21.8°', outside: false });
  });

  it('uses the clinic’s band before the default, and is null without any band', () => {
    const own: ReferenceBand = { ...knee, low: 10, high: 20, source: 'Clinic protocol', evidence: 'trade' };
    expect(bandLine(measure({ status: 'not_enough_data' }), [own, ...DEFAULT_REFERENCE_BANDS])!.text).toBe('Reference band 10–20°');
    expect(bandLine(measure({ key: 'step_time', unit: 's', status: 'not_enough_data' }), [])).toBeNull();
  });
});
