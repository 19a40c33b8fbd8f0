import { describe, expect, it } from 'vitest';
import { capabilityCurves } from '../../../shared/engine/capability-curves';
import { aWorkedExampleBus, relativeError } from '../support/engine-builders';

describe('capabilityCurves', () => {
  it('draws the traction envelope as min(force limit, power / speed)', () => {
    const chart = capabilityCurves(aWorkedExampleBus({ maxTractionForceN: 40_000, tractionPowerW: 200_000 }), {
      speedsMps: [0, 2, 5, 10, 20],
    });

    expect(chart.tractionEnvelopeN).toEqual([40_000, 40_000, 40_000, 20_000, 10_000]);
  });

  it('draws the regen envelope negative, fading linearly to zero below the fade-out speed', () => {
    const chart = capabilityCurves(aWorkedExampleBus({ regenPowerW: 100_000, maxTractionForceN: 40_000, regenMinSpeedMps: 2 }), {
      speedsMps: [0, 1, 5, 10],
    });

    // At 1 m/s the force limit (40 kN) is halved by the fade (1 of 2 m/s); above, the power limit P/v.
    expect(chart.regenEnvelopeN).toEqual([0, -20_000, -20_000, -10_000]);
  });

  it('needs 12 677.6 N at 30 km/h on 6 % at 1000 m (engine README §1.4 a)', () => {
    const chart = capabilityCurves(aWorkedExampleBus(), {
      speedsMps: [30 / 3.6],
      gradesPercent: [6],
      accelerationsMps2: [0],
      altitudeM: 1_000,
    });

    expect(relativeError(chart.curves[0]!.requiredForceN[0]!, 12_677.6)).toBeLessThan(1e-3);
  });

  it('gives one curve per grade and acceleration by default (−10…+12 %, three accelerations)', () => {
    const chart = capabilityCurves(aWorkedExampleBus());

    expect(chart.curves).toHaveLength(12 * 3);
    expect(chart.speedsMps).toHaveLength(chart.tractionEnvelopeN.length);
  });

  it('throws naming vehicle.frontalAreaM2 when it is negative', () => {
    expect(() => capabilityCurves(aWorkedExampleBus({ frontalAreaM2: -1 }))).toThrow(/vehicle\.frontalAreaM2/);
  });
});
