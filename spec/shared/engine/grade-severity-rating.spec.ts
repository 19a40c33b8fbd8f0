import { describe, expect, it } from 'vitest';
import {
  gsrsAdvanceTemperatureC,
  gsrsBrakeHorsepower,
  gsrsEmergencyStopRiseF,
  gsrsFinalTemperatureF,
} from '../../../shared/engine/grade-severity-rating';
import { fahrenheitToCelsius, mphToMps } from '../../../shared/engine/unit-conversions';
import { WATTS_PER_HORSEPOWER } from '../../../shared/engine/constants';

// engine README §4.2 worked example / §8 case 14 (updated GSRS, WY-1901F): 80 000 lb, 6 %, 5 mi,
// 30 mph, T0 150 °F, T∞ 90 °F.
describe('updated FHWA Grade Severity Rating System', () => {
  it('gives 274.45 brake hp (engine README §8 case 14)', () => {
    expect(gsrsBrakeHorsepower(80_000, 0.06, 30)).toBeCloseTo(274.45, 2);
  });

  it('gives T_f 417.1 °F, T_e 22.4 °F and T_lim 439.5 °F (engine README §8 case 14)', () => {
    const finalF = gsrsFinalTemperatureF({ initialF: 150, ambientF: 90, brakeHorsepower: 274.45, lengthMi: 5, speedMph: 30 });
    const riseF = gsrsEmergencyStopRiseF(80_000, 30);

    expect(finalF).toBeCloseTo(417.1, 1);
    expect(riseF).toBeCloseTo(22.4, 1);
    expect(finalF + riseF).toBeCloseTo(439.5, 1);
  });

  it('gives the same temperature in SI as in customary units', () => {
    const speedMps = mphToMps(30);
    const durationS = (5 / 30) * 3_600;

    const finalC = gsrsAdvanceTemperatureC(
      fahrenheitToCelsius(150),
      fahrenheitToCelsius(90),
      274.45 * WATTS_PER_HORSEPOWER,
      speedMps,
      durationS,
    );

    expect(finalC).toBeCloseTo(fahrenheitToCelsius(417.1), 1);
  });

  it('exceeds 500 °F at 20 mph but not at 18 mph over 10 mi of 6 % (engine README §4.2 speed sensitivity)', () => {
    const tLim = (mph: number) =>
      gsrsFinalTemperatureF({
        initialF: 150,
        ambientF: 90,
        brakeHorsepower: gsrsBrakeHorsepower(80_000, 0.06, mph),
        lengthMi: 10,
        speedMph: mph,
      }) + gsrsEmergencyStopRiseF(80_000, mph);

    expect(tLim(20)).toBeCloseTo(507.1, 0);
    expect(tLim(18)).toBeLessThan(500);
    expect(tLim(20)).toBeGreaterThan(500);
  });
});
