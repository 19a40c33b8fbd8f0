/**
 * Safety-grade assessment of descents, on top of the nominal run:
 *
 * - Worst credible case: the whole route run again with these adverse conditions taken together
 *   — regeneration unavailable (a battery-management or inverter trip, a full pack, line
 *   over-voltage, a dewirement; regeneration is not a fail-safe brake), and with it a braking
 *   resistor, which the motor feeds (an independent hydrodynamic or eddy-current retarder keeps
 *   working); the battery at its ceiling; the heaviest mass the vehicle may carry (a stated worst
 *   mass, else its permissible gross mass, else the run's own mass, and never less than that); a
 *   hot ambient (the network's worst-case ambient, or the run's own where that is hotter, with
 *   the air density at that temperature); and the brakes entering each descent as hot as that run
 *   leaves them from everything before (the run starts at least at the worst-case ambient). The
 *   run keeps the nominal speeds, so the vehicle spends no extra time cooling. A descent's worst
 *   case is never reported cooler than its nominal run.
 * - Sensitivity: the descent replayed (regeneration working, the run's own speeds, from the run's
 *   state at the top) with one input moved at a time: SOC ±5 points, mass ±10 %, brake cooling
 *   ±30 %, brake thermal mass ±20 %, and the regeneration rating (low: the continuous rating
 *   throughout; high: the peak rating throughout).
 * - Adhesion: the adhesion a descent needs to hold its speed and make a service stop at the
 *   comfort deceleration, on all wheels: μ_req = (F_hold + (1+δ)·m·d) / (m·g·cos θ), with
 *   F_hold = m·g·sin θ_down − rolling − aero at the run's speed.
 * - Drivability: stretches where the model does not hold, so no advice is given there: steeper
 *   than the road design limit; uphill beyond what the motor or the driven axles' adhesion can
 *   climb (m·g·(sin θ + Cr·cos θ) > min(F_max, μ·share·m·g·cos θ)); downhill beyond what all
 *   wheels' adhesion can hold at rest (sin θ − Cr·cos θ > μ·cos θ); or where the speed profile
 *   crawls below the crawl speed for the crawl distance or longer.
 */
import type {
  AnalysisOptions,
  Adhesion,
  Conditions,
  DrivabilityStretch,
  SafetySettings,
  SensitivityEntry,
  SensitivityInput,
  Vehicle,
  WorstCase,
  WorstCaseConditions,
} from '../domain/analysis';
import { adhesionCoefficient } from './adhesion';
import { airDensityUnchecked } from './atmosphere';
import { CELSIUS_TO_KELVIN_K } from './constants';
import { brakeRiskLevel, replayDescent, solveMaxSafeSpeed, stateAt, type DescentRange } from './descents';
import { resolvedRetarderType } from './endurance-brake';
import { withVehicle } from './analyse-route';
import { runRouteFrom, type RouteRun } from './route-run';
import { governingBrakeTempC, initialVehicleState, type RouteModel } from './route-simulation';

export interface WorstCaseRun {
  model: RouteModel;
  run: RouteRun;
  conditions: Omit<WorstCaseConditions, 'brakeTempAtTopC'>;
}

/** The worst credible case of a whole route (see the module comment). */
export function runWorstCase(model: RouteModel, nominalRun: RouteRun, conditions: Conditions, safety: SafetySettings): WorstCaseRun {
  const vehicle = model.vehicle;
  const runMassKg = vehicle.curbMassKg + vehicle.payloadKg;
  let massKg = runMassKg;
  let massBasis: WorstCaseConditions['massBasis'] = 'run-mass';
  if (safety.worstCaseMassKg !== undefined) {
    massKg = safety.worstCaseMassKg;
    massBasis = 'stated';
  } else if (vehicle.permissibleGrossMassKg !== undefined) {
    massKg = vehicle.permissibleGrossMassKg;
    massBasis = 'permissible-gross-mass';
  }
  if (massKg < runMassKg) {
    massKg = runMassKg;
    massBasis = 'run-mass';
  }
  const retarderType = resolvedRetarderType(vehicle);
  const worstVehicle: Vehicle = {
    ...vehicle,
    payloadKg: massKg - vehicle.curbMassKg,
    regenPowerW: 0,
    regenContinuousPowerW: 0,
    retarderType,
  };
  const segments = model.pointCount - 1;
  const ambientC = new Float64Array(segments);
  const airDensity = new Float64Array(segments);
  for (let k = 0; k < segments; k++) {
    const hot = Math.max(model.ambientC[k]!, safety.worstCaseAmbientC);
    ambientC[k] = hot;
    const altitudeM = 0.5 * (model.elevationM[k]! + model.elevationM[k + 1]!);
    airDensity[k] = airDensityUnchecked(altitudeM, hot + CELSIUS_TO_KELVIN_K);
  }
  const worstModel = withVehicle({ ...model, ambientC, airDensityKgM3: airDensity }, worstVehicle);
  const hasBattery = !model.powertrain.isOverheadLine && model.powertrain.batteryCapacityJ > 0;
  const socAtTop = hasBattery ? vehicle.socCeiling : null;
  const startBrakeC = Math.max(conditions.initialBrakeTempC ?? ambientC[0]!, ambientC[0]!);
  const run = runRouteFrom(worstModel, nominalRun.speedMps, initialVehicleState(socAtTop ?? conditions.startSoc, startBrakeC));
  return {
    model: worstModel,
    run,
    conditions: {
      regenerationAvailable: false,
      brakingResistorAvailable: false,
      retarderAvailable: retarderType === 'hydrodynamic' || retarderType === 'eddy-current',
      socAtTop,
      massKg,
      massBasis,
      ambientC: safety.worstCaseAmbientC,
      surface: conditions.surface,
    },
  };
}

/** A descent's worst case, from the worst-case run (never cooler than the nominal peak). */
export function describeWorstCase(
  worst: WorstCaseRun,
  range: DescentRange,
  nominalGoverningC: number,
  limitC: number,
  drivable: boolean,
): WorstCase {
  const { run, model } = worst;
  const first = range.firstSegment;
  const endPoint = range.lastSegment + 1;
  let front = Number.NEGATIVE_INFINITY;
  let rear = Number.NEGATIVE_INFINITY;
  let lump = Number.NEGATIVE_INFINITY;
  for (let i = first; i <= endPoint; i++) {
    front = Math.max(front, run.frontBrakeTempC[i]!);
    rear = Math.max(rear, run.rearBrakeTempC[i]!);
    lump = Math.max(lump, run.brakeTempC[i]!);
  }
  const peak = Math.max(lump, front, rear, nominalGoverningC);
  const advice = drivable ? solveMaxSafeSpeed(model, run, range, limitC) : { maxSafeSpeedKph: null, speedAdvice: 'not-drivable' as const };
  return {
    peakBrakeTempC: peak,
    peakBrakeTempByAxleC: { front, rear },
    risk: brakeRiskLevel(peak, model.vehicle.brakeType),
    maxSafeSpeedKph: advice.maxSafeSpeedKph,
    speedAdvice: advice.speedAdvice,
    conditions: { ...worst.conditions, brakeTempAtTopC: governingBrakeTempC(stateAt(run, first)) },
  };
}

/** The nominal model with one input moved down and up, built once per analysis. */
export interface SensitivityVariants {
  models: { input: SensitivityInput; low: RouteModel; high: RouteModel }[];
}

export function sensitivityVariants(model: RouteModel): SensitivityVariants {
  const v = model.vehicle;
  const scaled = (change: Partial<Vehicle>) => withVehicle(model, { ...v, ...change });
  const continuous = Math.min(v.regenPowerW, v.regenContinuousPowerW ?? v.regenPowerW);
  return {
    models: [
      {
        input: 'mass',
        low: scaled({ curbMassKg: 0.9 * v.curbMassKg, payloadKg: 0.9 * v.payloadKg }),
        high: scaled({ curbMassKg: 1.1 * v.curbMassKg, payloadKg: 1.1 * v.payloadKg }),
      },
      {
        input: 'brake-cooling',
        low: scaled({ brakeCoolingAreaM2: 0.7 * v.brakeCoolingAreaM2 }),
        high: scaled({ brakeCoolingAreaM2: 1.3 * v.brakeCoolingAreaM2 }),
      },
      {
        input: 'brake-thermal-mass',
        low: scaled({ brakeThermalMassJPerK: 0.8 * v.brakeThermalMassJPerK }),
        high: scaled({ brakeThermalMassJPerK: 1.2 * v.brakeThermalMassJPerK }),
      },
      {
        input: 'regen-continuous',
        low: scaled({ regenPowerW: continuous, regenContinuousPowerW: continuous }),
        high: scaled({ regenContinuousPowerW: v.regenPowerW }),
      },
    ],
  };
}

/** SOC step of the sensitivity, points of SOC. */
const SOC_STEP = 0.05;

export function descentSensitivity(
  model: RouteModel,
  run: RouteRun,
  range: DescentRange,
  variants: SensitivityVariants,
): { entries: SensitivityEntry[]; dominant: SensitivityInput } {
  const start = stateAt(run, range.firstSegment);
  const peak = (m: RouteModel, soc: number) => replayDescent(m, run, range, null, soc, start.brakeTempC, { start }).peakGoverningC;
  const entries: SensitivityEntry[] = [
    {
      input: 'soc',
      lowPeakBrakeTempC: peak(model, Math.max(0, start.soc - SOC_STEP)),
      highPeakBrakeTempC: peak(model, Math.min(1, start.soc + SOC_STEP)),
    },
    ...variants.models.map(({ input, low, high }) => ({
      input,
      lowPeakBrakeTempC: peak(low, start.soc),
      highPeakBrakeTempC: peak(high, start.soc),
    })),
  ];
  let dominant = entries[0]!;
  for (const entry of entries) {
    if (Math.abs(entry.highPeakBrakeTempC - entry.lowPeakBrakeTempC) > Math.abs(dominant.highPeakBrakeTempC - dominant.lowPeakBrakeTempC))
      dominant = entry;
  }
  return { entries, dominant: dominant.input };
}

/** Adhesion needed on a descent against what the surface gives (module comment). */
export function descentAdhesion(model: RouteModel, run: RouteRun, range: DescentRange, serviceDecelerationMps2: number): Adhesion {
  const vehicle = model.vehicle;
  const mu = model.adhesionMu;
  let required = 0;
  let requiredAtM = model.distanceM[range.firstSegment]!;
  let regenLimited = false;
  const p = model.powertrain;
  for (let k = range.firstSegment; k <= range.lastSegment; k++) {
    const normalN = model.weightN * model.cosTheta[k]!;
    const holdN = Math.max(0, -(run.rollingN[k]! + run.aeroN[k]! + run.gradeN[k]!));
    const needed = (holdN + model.effectiveMassKg * serviceDecelerationMps2) / normalN;
    if (needed > required) {
      required = needed;
      requiredAtM = model.distanceM[k]!;
    }
    if (p.regenPowerW > 0) {
      const brakingN = Math.max(0, -run.tractionN[k]!);
      const v = Math.max(1e-9, 0.5 * (run.speedMps[k]! + run.speedMps[k + 1]!));
      const motorN = Math.min(p.maxRegenForceN, p.regenPowerW / v);
      if (Math.min(brakingN, motorN) > mu * vehicle.drivenAxleLoadShare * normalN * (1 + 1e-9)) regenLimited = true;
    }
  }
  return {
    surface: model.surface,
    availableMu: mu,
    requiredMu: required,
    requiredAtM,
    sufficient: required <= mu,
    regenLimitedByAdhesion: regenLimited,
  };
}

/** Stretches of the whole route that are not drivable as drawn (module comment). */
export function drivabilityStretches(model: RouteModel, run: RouteRun, options: AnalysisOptions): DrivabilityStretch[] {
  const safety = options.safety;
  const vehicle = model.vehicle;
  const segments = model.pointCount - 1;
  const mu = adhesionCoefficient(vehicle.runningGear, model.surface);
  const stretches: DrivabilityStretch[] = [];
  const add = (reason: DrivabilityStretch['reason'], k: number, detail: string) => {
    const fromM = model.distanceM[k]!;
    const toM = model.distanceM[k + 1]!;
    let last: DrivabilityStretch | undefined;
    for (let j = stretches.length - 1; j >= 0 && !last; j--) if (stretches[j]!.reason === reason) last = stretches[j];
    if (last && Math.abs(last.toM - fromM) < 1e-6) {
      last.toM = toM;
      last.detail = detail.length > 0 && worse(detail, last.detail) ? detail : last.detail;
      return;
    }
    stretches.push({ fromM, toM, reason, detail });
  };
  const crawlMps = safety.crawlSpeedKph / 3.6;
  let crawlStart = -1;
  for (let k = 0; k <= segments; k++) {
    if (k < segments) {
      const grade = model.gradePercent[k]!;
      const sin = model.sinTheta[k]!;
      const cos = model.cosTheta[k]!;
      const cr = vehicle.rollingResistanceCoefficient;
      if (Math.abs(grade) > safety.maxRoadGradePercent) {
        add(
          'steeper-than-road-limit',
          k,
          `grade ${Math.abs(grade).toFixed(1)} % against a road design limit of ${safety.maxRoadGradePercent} %`,
        );
      }
      if (sin > 0) {
        const neededN = model.weightN * (sin + cr * cos);
        const availableN = Math.min(vehicle.maxTractionForceN, mu * vehicle.drivenAxleLoadShare * model.weightN * cos);
        if (neededN > availableN) {
          add(
            'beyond-traction',
            k,
            `climbing ${grade.toFixed(1)} % needs ${Math.round(neededN / 1000)} kN, the vehicle can give ${Math.round(availableN / 1000)} kN here`,
          );
        }
      } else if (-sin - cr * cos > mu * cos) {
        add('beyond-braking-adhesion', k, `grade ${grade.toFixed(1)} % is steeper than all wheels' adhesion (μ ${mu}) can hold`);
      }
    }
    const slow = k < model.pointCount && run.speedMps[k]! < crawlMps && model.dwellS[k]! === 0;
    if (slow && crawlStart < 0) crawlStart = k;
    if ((!slow || k === segments) && crawlStart >= 0) {
      const endPoint = slow ? k : k - 1;
      const lengthM = model.distanceM[endPoint]! - model.distanceM[crawlStart]!;
      if (lengthM >= safety.crawlDistanceM) {
        stretches.push({
          fromM: model.distanceM[crawlStart]!,
          toM: model.distanceM[endPoint]!,
          reason: 'crawl',
          detail: `below ${safety.crawlSpeedKph} km/h for ${Math.round(lengthM)} m`,
        });
      }
      crawlStart = -1;
    }
  }
  return stretches.sort((a, b) => a.fromM - b.fromM);
}

/** Keeps the detail naming the larger figure when stretches merge (first number compared). */
function worse(candidate: string, current: string): boolean {
  const number = (text: string) => Number.parseFloat(/-?\d+(\.\d+)?/.exec(text)?.[0] ?? '0');
  return Math.abs(number(candidate)) > Math.abs(number(current));
}
