import { describe, expect, it } from 'vitest';
import { describeDescentAdvice } from '../../../shared/presentation/descent-advice';

describe('describeDescentAdvice', () => {
  const limited = { speedAdvice: 'limit' as const, maxSafeSpeedKph: 21.6, maxTopSoc: 0.879, fadeThresholdC: 350 };

  it('advises the speed rounded down, the same number on every output (issue 10: 21 on screen, 20 in the e-mail)', () => {
    const advice = describeDescentAdvice(limited, 'metric');

    expect(advice.speedHeadline).toBe('Highest safe descent speed: 21 km/h');
    expect(advice.short).toContain('at or below 21 km/h');
  });

  it('advises the SOC at the top rounded down', () => {
    const advice = describeDescentAdvice(limited, 'metric');

    expect(advice.socHeadline).toBe('Highest battery charge (SOC) at the top: 87 %');
    expect(advice.short).toContain('at or below 87 % SOC');
  });

  it('says no speed is slow enough when the brakes fade even at walking pace', () => {
    const advice = describeDescentAdvice({ ...limited, speedAdvice: 'not-holdable', maxSafeSpeedKph: null }, 'imperial');

    expect(advice.speedHeadline).toBe('No speed is slow enough');
    expect(advice.speedExplanation).toContain('662 °F');
  });

  it('says so when regeneration cannot take the descent at any SOC', () => {
    const advice = describeDescentAdvice({ ...limited, maxTopSoc: null }, 'metric');

    expect(advice.socHeadline).toBe('Battery charge is not the limit');
  });

  it('says no charge is low enough, naming the margin, when even an empty battery leaves the brakes too hot', () => {
    const advice = describeDescentAdvice(
      { ...limited, maxTopSoc: null, maxTopSocReason: 'no-soc-keeps-brakes-cool', fadeMarginK: 50 },
      'metric',
    );

    expect(advice.socHeadline).toBe('No battery charge is low enough');
    expect(advice.socExplanation).toContain('50 K below 350 °C');
  });

  it('says battery charge plays no part for an overhead-line vehicle', () => {
    const advice = describeDescentAdvice({ ...limited, maxTopSoc: null, maxTopSocReason: 'no-battery' }, 'metric');

    expect(advice.socHeadline).toBe('Battery charge plays no part');
  });

  it('gives no speed and no charge advice where the descent is not drivable as drawn', () => {
    const advice = describeDescentAdvice(
      { ...limited, speedAdvice: 'not-drivable', maxSafeSpeedKph: null, maxTopSoc: null, maxTopSocReason: 'not-drivable' },
      'metric',
    );

    expect(advice.speedHeadline).toBe('No speed advice: not drivable as drawn');
    expect(advice.short).not.toMatch(/km\/h/);
    expect(advice.socHeadline).toBe('No charge advice: not drivable as drawn');
  });

  it('states the margin in the speed explanation (50 K is 90 °F of difference)', () => {
    expect(describeDescentAdvice({ ...limited, fadeMarginK: 50 }, 'metric').speedExplanation).toContain('stay 50 K below 350 °C');
    expect(describeDescentAdvice({ ...limited, fadeMarginK: 50 }, 'imperial').speedExplanation).toContain('stay 90 °F below 662 °F');
  });
});
