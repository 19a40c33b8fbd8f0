import { BRAKE_RISK_BANDS_C } from '@shared/engine/descents';
import { brakeRiskBands } from '../../../web/app/charts/risk-bands';

describe('brakeRiskBands', () => {
  it('shades the drum bands when the fade threshold is the drum "high" edge', () => {
    const bands = brakeRiskBands(BRAKE_RISK_BANDS_C.drum.high, 'metric');
    expect(bands.map((b) => [b.from, b.to])).toEqual([
      [200, 260],
      [260, 340],
      [340, 1_340],
    ]);
    expect(bands.map((b) => b.label)).toEqual(['Elevated', 'High: brakes fade', 'Critical']);
  });

  it('falls back to the disc bands when no descent tells the brake type', () => {
    expect(brakeRiskBands(undefined, 'metric')[0]).toMatchObject({ from: 300, to: 450 });
  });

  it('converts the edges to °F in imperial units', () => {
    expect(brakeRiskBands(BRAKE_RISK_BANDS_C.disc.high, 'imperial')[0]!.from).toBeCloseTo(572, 6);
  });
});
