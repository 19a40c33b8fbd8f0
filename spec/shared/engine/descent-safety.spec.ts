import { describe, expect, it } from 'vitest';
import { vehicleSchema, type PreviewRequestInput, type VehicleInput } from '../../../shared/domain/analysis';
import {
  adhesionCoefficient,
  analyseRouteDetailed,
  emptyPowerSplit,
  independentRetarderPowerW,
  powertrainParams,
  presetVehicle,
  splitWheelPower,
  STANDARD_GRAVITY_MPS2,
} from '../../../shared/engine/index';
import { aStraightRoute, aWorkedExampleBus, relativeError } from '../support/engine-builders';

/*
 * One constant descent worked by hand: 5 000 m horizontal at −7 % (tan θ = 0.07), held at 30 km/h.
 * No air drag (Cd 0) and no radiation (ε 0), so the brake model is linear and its exact
 * exponential solution can be written down:
 *
 *   sin θ = 0.07/√1.0049 = 0.069829,  cos θ = 1/√1.0049 = 0.997559
 *   W = 19 000 kg · 9.80665 = 186 326.35 N
 *   F_brake = W·sin θ − Cr·W·cos θ = 13 011.0 − 1 301.1 = 11 709.9 N
 *   P_brake = F_brake · 8.3333 m/s = 97 582 W at the wheel
 *   t = 5 000·√1.0049 / 8.3333 = 601.47 s along the road
 *   h = 12 + 4.5·8.3333 = 49.5 W/(m²·K)
 *   rear group: 60 % of the heat (φ = 0.95) into half of C = 92 000 J/K and of A = 1.6 m²
 *   T(t) = T_ss + (T_0 − T_ss)·exp(−t·h·A_r/C_r),  T_ss = T_amb + q/(h·A_r)
 */
const GRADE = 0.07;
const SPEED_MPS = 30 / 3.6;
const MASS_KG = 19_000;
const SIN = GRADE / Math.sqrt(1 + GRADE * GRADE);
const COS = 1 / Math.sqrt(1 + GRADE * GRADE);
const WEIGHT_N = MASS_KG * STANDARD_GRAVITY_MPS2;
const BRAKE_FORCE_N = WEIGHT_N * SIN - 0.007 * WEIGHT_N * COS;
const BRAKE_POWER_W = BRAKE_FORCE_N * SPEED_MPS;
const DURATION_S = (5_000 * Math.sqrt(1 + GRADE * GRADE)) / SPEED_MPS;
const H = 12 + 4.5 * SPEED_MPS;

function groupEndC(ambientC: number, startC: number, heatW: number, massShare: number): number {
  const conductance = H * 1.6 * massShare;
  const steady = ambientC + heatW / conductance;
  return steady + (startC - steady) * Math.exp((-DURATION_S * conductance) / (92_000 * massShare));
}

function aConstantDescent(vehicle: Partial<VehicleInput> = {}, conditions: PreviewRequestInput['conditions'] = {}): PreviewRequestInput {
  return {
    route: { type: 'LineString', coordinates: aStraightRoute(5_000, (s) => 1_000 - GRADE * s) },
    vehicle: aWorkedExampleBus({ dragCoefficient: 0, brakeEmissivity: 0, regenPowerW: 60_000, ...vehicle }),
    conditions: { ambientC: 10, startSoc: 0.5, ...conditions },
    options: { speedLimitKph: 30, startAtRest: false, endAtRest: false, smoothingWindowM: 0 },
  };
}

describe('worst credible case against regeneration working, on one descent worked by hand', () => {
  it('checks the hand figures themselves: 11 709.9 N and 97.58 kW of braking over 601.5 s', () => {
    expect(BRAKE_FORCE_N).toBeCloseTo(11_709.9, 0);
    expect(BRAKE_POWER_W).toBeCloseTo(97_582, -1);
    expect(DURATION_S).toBeCloseTo(601.47, 1);
  });

  it('regeneration working (60 kW): friction takes 97 582 − 60 000 W and the rear group ends at 228.7 °C from 10 °C', async () => {
    const { response, run } = await analyseRouteDetailed(aConstantDescent());
    const descent = response.descents[0]!;
    // Rear: q = 0.6·0.95·37 582 = 21 422 W, T_ss = 10 + 21 422/39.6 = 551.0 °C,
    // exp(−601.47·39.6/46 000) = 0.5958 → 551.0 − 541.0·0.5958 = 228.7 °C.
    const frictionW = BRAKE_POWER_W - 60_000;
    const rear = groupEndC(10, 10, 0.6 * 0.95 * frictionW, 0.5);
    const front = groupEndC(10, 10, 0.4 * 0.95 * frictionW, 0.5);

    expect(run.regenPowerW[100]).toBeCloseTo(60_000, 3);
    expect(relativeError(run.frictionBrakePowerW[100]!, frictionW)).toBeLessThan(1e-6);
    expect(rear).toBeCloseTo(228.7, 0);
    expect(relativeError(descent.peakBrakeTempByAxleC!.rear, rear)).toBeLessThan(1e-6);
    expect(relativeError(descent.peakBrakeTempByAxleC!.front, front)).toBeLessThan(1e-6);
    expect(descent.nominalRisk).toBe('low');
  });

  it('regeneration lost, 35 °C ambient, brakes from 35 °C: all 97 582 W to friction, the rear group ends at 602.7 °C (critical)', async () => {
    const { response } = await analyseRouteDetailed(aConstantDescent());
    const worst = response.descents[0]!.worstCase!;
    // Rear: q = 0.6·0.95·97 582 = 55 622 W, T_ss = 35 + 55 622/39.6 = 1 439.6 °C → 1 439.6 − 1 404.6·0.5958 = 602.7 °C.
    // Front: q = 0.4·0.95·97 582 = 37 081 W, T_ss = 35 + 37 081/39.6 = 971.4 °C → 413.5 °C.
    const rear = groupEndC(35, 35, 0.6 * 0.95 * BRAKE_POWER_W, 0.5);
    const front = groupEndC(35, 35, 0.4 * 0.95 * BRAKE_POWER_W, 0.5);

    expect(rear).toBeCloseTo(602.7, 0);
    expect(front).toBeCloseTo(413.5, 0);
    expect(relativeError(worst.peakBrakeTempByAxleC!.rear, rear)).toBeLessThan(1e-6);
    expect(relativeError(worst.peakBrakeTempByAxleC!.front, front)).toBeLessThan(1e-6);
    expect(relativeError(worst.peakBrakeTempC, rear)).toBeLessThan(1e-6);
    expect(worst.risk).toBe('critical');
    expect(worst.conditions).toMatchObject({
      regenerationAvailable: false,
      massKg: MASS_KG,
      massBasis: 'run-mass',
      ambientC: 35,
      brakeTempAtTopC: 35,
    });
    // The descent shows the worst case's risk, the nominal one beside it.
    expect(response.descents[0]!.risk).toBe('critical');
    expect(response.descents[0]!.nominalRisk).toBe('low');
  });

  it('runs the worst case at the permissible gross mass when the vehicle states one', async () => {
    const { response } = await analyseRouteDetailed(aConstantDescent({ permissibleGrossMassKg: 20_000 }));
    const worst = response.descents[0]!.worstCase!;
    // 20 t instead of 19 t: braking force and power scale with the mass (Cd 0), 97 582·20/19 = 102 718 W.
    const rear = groupEndC(35, 35, 0.6 * 0.95 * BRAKE_POWER_W * (20_000 / MASS_KG), 0.5);

    expect(worst.conditions.massBasis).toBe('permissible-gross-mass');
    expect(worst.conditions.massKg).toBe(20_000);
    expect(relativeError(worst.peakBrakeTempByAxleC!.rear, rear)).toBeLessThan(1e-6);
  });

  it('finds no speed that holds the worst case, because even walking pace leaves the rear group at 468 °C', async () => {
    const { response } = await analyseRouteDetailed(aConstantDescent());
    const descent = response.descents[0]!;
    // At 5 km/h: P = 11 709.9 N · 1.3889 m/s = 16 263 W, rear q = 0.57 · 16 263 = 9 270 W,
    // G = (12 + 4.5·1.3889)·0.8 = 14.6 W/K, T_ss = 35 + 9 270/14.6 = 670 °C, t = 5 012.2/1.3889 = 3 609 s,
    // T_end = 670 − 635·exp(−3 609·14.6/46 000) = 670 − 635·0.318 = 468 °C > 450 − 50 = 400 °C.
    const walkMps = 5 / 3.6;
    const heatW = 0.6 * 0.95 * BRAKE_FORCE_N * walkMps;
    const conductance = (12 + 4.5 * walkMps) * 0.8;
    const steady = 35 + heatW / conductance;
    const durationS = (5_000 * Math.sqrt(1 + GRADE * GRADE)) / walkMps;
    const endC = steady + (35 - steady) * Math.exp((-durationS * conductance) / 46_000);

    expect(endC).toBeCloseTo(468, -1);
    expect(endC).toBeGreaterThan(400);
    expect(descent.worstCase!.speedAdvice).toBe('not-holdable');
    expect(descent.worstCase!.maxSafeSpeedKph).toBeNull();
  });
});

describe('continuous regeneration rating', () => {
  it('holds the 100 kW peak for 60 s worth of overload, then falls to the 60 kW continuous rating', async () => {
    const { run, model } = await analyseRouteDetailed(
      aConstantDescent({ regenPowerW: 100_000, regenContinuousPowerW: 60_000, regenPeakHoldS: 60 }),
    );
    // Overload budget (100 − 60 kW)·60 s = 2.4 MJ, used at 97 582 − 60 000 = 37 582 W:
    // 2.4e6/37 582 = 63.9 s = 532 m at 8.333 m/s; regeneration takes all braking before, 60 kW after.
    const switchM = ((40_000 * 60) / (BRAKE_POWER_W - 60_000)) * SPEED_MPS;
    const before = model.distanceM.findIndex((s) => s > switchM - 30);
    const after = model.distanceM.findIndex((s) => s > switchM + 30);

    expect(switchM).toBeCloseTo(532, -1);
    expect(relativeError(run.regenPowerW[before]!, BRAKE_POWER_W)).toBeLessThan(1e-6);
    expect(run.regenPowerW[after]).toBeCloseTo(60_000, 3);
  });
});

describe('electric brake envelope', () => {
  const split = emptyPowerSplit();
  const params = (vehicle: Partial<VehicleInput>) => powertrainParams(vehicleSchema.parse(aWorkedExampleBus(vehicle)));

  it('keeps regeneration plus a braking resistor inside the motor envelope: 250 kW demanded, 100 kW motor, full battery', () => {
    // SOC at the 0.95 ceiling: the battery takes only the 15 kW auxiliaries, 15 000/0.889 = 16 873 W at the wheel.
    // Resistor: min(100 kW rating, 100 kW motor − 16 873 W) = 83 127 W. Friction: 250 000 − 100 000 = 150 000 W.
    splitWheelPower(
      params({ regenPowerW: 100_000, retarderPowerW: 100_000, retarderType: 'braking-resistor' }),
      -250_000,
      10,
      0.95,
      1,
      split,
    );

    expect(split.regenWheelPowerW).toBeCloseTo(15_000 / 0.889, 6);
    expect(split.retarderPowerW).toBeCloseTo(100_000 - 15_000 / 0.889, 6);
    expect(split.frictionPowerW).toBeCloseTo(150_000, 6);
  });

  it('loses the braking resistor with regeneration when the motor gives no braking', () => {
    splitWheelPower(params({ regenPowerW: 0, retarderPowerW: 100_000, retarderType: 'braking-resistor' }), -250_000, 10, 0.5, 1, split);

    expect(split.retarderPowerW).toBe(0);
    expect(split.frictionPowerW).toBe(250_000);
  });

  it('brakes a tram at no more than its 500 kW motor, regeneration and resistors together', () => {
    const tram = powertrainParams(vehicleSchema.parse(presetVehicle('light-rail-vehicle')));
    splitWheelPower(tram, -1_000_000, 10, 0.5, 1, split);

    expect(split.regenWheelPowerW + split.retarderPowerW).toBeCloseTo(500_000, 6);
    expect(split.frictionPowerW).toBeCloseTo(500_000, 6);
  });

  it('gives a hydrodynamic retarder rated 200 kW at 50 km/h one eighth of it at 25 km/h: 200·(25/50)³ = 25 kW', () => {
    expect(independentRetarderPowerW('hydrodynamic', 200_000, 25 / 3.6)).toBeCloseTo(25_000, 6);
    expect(independentRetarderPowerW('hydrodynamic', 200_000, 70 / 3.6)).toBe(200_000);
    expect(independentRetarderPowerW('hydrodynamic', 200_000, 0)).toBe(0);
  });

  it('gives an eddy-current retarder rated 100 kW at 30 km/h a quarter of it at 15 km/h: 100·(15/30)² = 25 kW', () => {
    expect(independentRetarderPowerW('eddy-current', 100_000, 15 / 3.6)).toBeCloseTo(25_000, 6);
    expect(independentRetarderPowerW('eddy-current', 100_000, 40 / 3.6)).toBe(100_000);
  });

  it('keeps an independent retarder working when regeneration is lost', () => {
    splitWheelPower(params({ regenPowerW: 0, retarderPowerW: 200_000, retarderType: 'hydrodynamic' }), -250_000, 25 / 3.6, 0.5, 1, split);

    expect(split.retarderPowerW).toBeCloseTo(25_000, 6);
    expect(split.frictionPowerW).toBeCloseTo(225_000, 6);
  });
});

describe('adhesion', () => {
  it('names the published coefficients: road dry 0.65 / wet 0.50 / snow 0.20 / ice 0.10, rail 0.25 / 0.10 / 0.05 / 0.02', () => {
    expect(['dry', 'wet', 'snow', 'ice'].map((surface) => adhesionCoefficient('road', surface as 'dry'))).toEqual([0.65, 0.5, 0.2, 0.1]);
    expect(['dry', 'wet', 'snow', 'ice'].map((surface) => adhesionCoefficient('rail', surface as 'dry'))).toEqual([0.25, 0.1, 0.05, 0.02]);
  });

  it('caps regeneration on ice at μ × driven-axle load and flags the service stop the ice cannot give', async () => {
    const { run, response } = await analyseRouteDetailed(aConstantDescent({ regenPowerW: 300_000 }, { surface: 'ice' }));
    const descent = response.descents[0]!;
    // Cap: 0.10 · 0.6 · 186 326.35 N · 0.997559 = 11 152.3 N → 11 152.3 · 8.3333 = 92 936 W of regeneration;
    // the other 97 582 − 92 936 = 4 646 W go to the friction brakes on all wheels.
    const capW = 0.1 * 0.6 * WEIGHT_N * COS * SPEED_MPS;
    // Holding speed and stopping at 1.2 m/s² needs (11 709.9 + 19 000·1.2)/(186 326.35·0.997559) = 0.1857 > 0.10.
    const requiredMu = (BRAKE_FORCE_N + MASS_KG * 1.2) / (WEIGHT_N * COS);

    expect(capW).toBeCloseTo(92_936, -1);
    expect(relativeError(run.regenPowerW[100]!, capW)).toBeLessThan(1e-6);
    expect(relativeError(run.frictionBrakePowerW[100]!, BRAKE_POWER_W - capW)).toBeLessThan(1e-5);
    expect(requiredMu).toBeCloseTo(0.1857, 3);
    expect(descent.adhesion).toMatchObject({ surface: 'ice', availableMu: 0.1, sufficient: false, regenLimitedByAdhesion: true });
    expect(relativeError(descent.adhesion!.requiredMu, requiredMu)).toBeLessThan(1e-6);
  });

  it('does not cap regeneration on a dry road, where the same stop needs 0.19 of the 0.65 available', async () => {
    const { run, response } = await analyseRouteDetailed(aConstantDescent({ regenPowerW: 300_000 }));

    expect(relativeError(run.regenPowerW[100]!, BRAKE_POWER_W)).toBeLessThan(1e-6);
    expect(response.descents[0]!.adhesion).toMatchObject({ sufficient: true, regenLimitedByAdhesion: false });
  });
});

describe('drivability', () => {
  it('gives no advice on a descent with a −39 % stretch and says why', async () => {
    // 3 km at −5 % with 300 m at −39 % in the middle: far beyond the 15 % road design limit.
    const profile = (s: number) => (s < 1_500 ? 1_500 - 0.05 * s : s < 1_800 ? 1_425 - 0.39 * (s - 1_500) : 1_308 - 0.05 * (s - 1_800));
    const { response } = await analyseRouteDetailed({
      route: { type: 'LineString', coordinates: aStraightRoute(3_000, profile, { vertexSpacingM: 10 }) },
      vehicle: aWorkedExampleBus(),
      conditions: { ambientC: 10, startSoc: 0.9 },
      options: { speedLimitKph: 50, smoothingWindowM: 0 },
    });
    const descent = response.descents[0]!;

    expect(response.drivability!.drivable).toBe(false);
    expect(descent.drivability!.stretches.map((stretch) => stretch.reason)).toContain('steeper-than-road-limit');
    const steep = descent.drivability!.stretches.find((stretch) => stretch.reason === 'steeper-than-road-limit')!;
    expect(steep.fromM).toBeCloseTo(1_500, -1);
    expect(steep.toM).toBeCloseTo(1_800, -1);
    expect(steep.detail).toMatch(/39\.0 %/);
    expect(descent.speedAdvice).toBe('not-drivable');
    expect(descent.maxSafeSpeedKph).toBeNull();
    expect(descent.worstCase!.speedAdvice).toBe('not-drivable');
    expect(descent.maxTopSoc).toBeNull();
    expect(descent.maxTopSocReason).toBe('not-drivable');
  });

  it('finds the same route drivable when the road design limit is set above its steepest grade', async () => {
    const { response } = await analyseRouteDetailed({
      ...aConstantDescent(),
      options: { ...aConstantDescent().options, safety: { maxRoadGradePercent: 8 } },
    });

    expect(response.drivability).toEqual({ drivable: true, stretches: [] });
    expect(response.descents[0]!.speedAdvice).not.toBe('not-drivable');
  });
});

describe('sensitivity', () => {
  it('moves the peak the physical way for each input and names the widest spread', async () => {
    const { response } = await analyseRouteDetailed(aConstantDescent({}, { startSoc: 0.9 }));
    const descent = response.descents[0]!;
    const entry = (input: string) => descent.sensitivity!.find((candidate) => candidate.input === input)!;
    const spread = (input: string) => Math.abs(entry(input).highPeakBrakeTempC - entry(input).lowPeakBrakeTempC);

    expect(descent.sensitivity!.map((candidate) => candidate.input)).toEqual([
      'soc',
      'mass',
      'brake-cooling',
      'brake-thermal-mass',
      'regen-continuous',
    ]);
    expect(entry('mass').highPeakBrakeTempC).toBeGreaterThan(entry('mass').lowPeakBrakeTempC);
    expect(entry('brake-cooling').highPeakBrakeTempC).toBeLessThan(entry('brake-cooling').lowPeakBrakeTempC);
    expect(entry('brake-thermal-mass').highPeakBrakeTempC).toBeLessThan(entry('brake-thermal-mass').lowPeakBrakeTempC);
    // No continuous rating stated: both ends are the peak rating.
    expect(spread('regen-continuous')).toBe(0);
    const widest = Math.max(...descent.sensitivity!.map((candidate) => spread(candidate.input)));
    expect(spread(descent.sensitivityDominantInput!)).toBe(widest);
  });
});
