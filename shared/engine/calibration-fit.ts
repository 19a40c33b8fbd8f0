/**
 * Fitting a vehicle profile to logged trips.
 *
 * Model: every trip is replayed through the engine on its measured speed (analyse-route.ts,
 * `SpeedTrace`); the battery power of each replay step (replay-comparison.ts) is the model's
 * answer for a parameter vector θ. The fit minimises the duration-weighted squared residuals
 *
 *   S(θ) = Σₖ Δtₖ·(P_meas,k − P_model,k(θ))²        over the steps of all trips together
 *
 * by bounded nonlinear least squares: the Levenberg–Marquardt method of the `ml-levenberg-marquardt`
 * package (parameters clamped to their bounds after each step), on parameters scaled by their
 * starting values so all are of order one.
 *
 * 95 % intervals (linearised, from the Jacobian at the solution): J = ∂P_model/∂θ by central
 * differences, weighted by √Δt; σ̂² = S(θ̂)/(N − p); Cov(θ̂) = σ̂²·(JᵀWJ)⁻¹; θ̂ ± t₀.₉₇₅,ν·√Cov_ii.
 * Residuals of a time series are correlated from one step to the next, which makes the plain
 * formula too optimistic. The covariance is therefore inflated by (1 + ρ₁)/(1 − ρ₁), ρ₁ the lag-1
 * autocorrelation of the residuals, the variance inflation of the mean of an AR(1) series; ν is
 * the matching effective number of steps N·(1 − ρ₁)/(1 + ρ₁) less p.
 *
 * Parameters the trips cannot tell apart show as strongly correlated estimates (|r| ≥ 0.9) or
 * as a nearly singular normal matrix (condition number of the correlation-scaled JᵀWJ above
 * 10⁸); both are reported as warnings with the parameters named. Classic case: trips run at
 * one speed cannot separate rolling resistance (∝ v) from drag (∝ v³) in the traction power.
 *
 * Brake thermal parameters (thermal mass, cooled area) are fitted on the logged brake
 * temperatures: first alone, with the powertrain held at its fit, then jointly with the
 * powertrain parameters on both residuals, each scaled by its own scatter (σ̂ of the separate
 * fits). The friction heat depends on how much braking regeneration takes, so the joint fit lets
 * the brake intervals carry the uncertainty of the regeneration efficiency, and the brake
 * temperatures inform it in turn.
 */
import { levenbergMarquardt } from 'ml-levenberg-marquardt';
import { EigenvalueDecomposition, Matrix, inverse } from 'ml-matrix';
import type { Vehicle } from '../domain/analysis';
import { withVehicle } from './analyse-route';
import { STANDARD_GRAVITY_MPS2 } from './constants';
import {
  comparePointValues,
  comparePower,
  replaySteps,
  type ErrorStatistics,
  type PowerComparison,
  type ReplaySteps,
} from './replay-comparison';
import { runRoute, type RouteRun } from './route-run';
import type { RouteModel } from './route-simulation';
import type { AlignedTrip } from './trip-alignment';
import { BRAKE_FIT_PARAMETERS, FIT_BOUNDS, FIT_PARAMETER_LABELS, POWER_FIT_PARAMETERS, type FitParameter } from './calibration-parameters';

export * from './calibration-parameters';

/** Air density for the road-load coefficients, kg/m³: the reference density of 40 CFR 1066.310. */
export const ROAD_LOAD_REFERENCE_AIR_DENSITY_KG_M3 = 1.17;

/** Correlation above which two estimates are reported as not told apart. */
export const INDISTINGUISHABLE_CORRELATION = 0.9;
/** Condition number of the correlation-scaled normal matrix above which the fit is ill-conditioned. */
export const ILL_CONDITIONED_ABOVE = 1e8;

/** One logged trip ready for fitting. */
export interface CalibrationTrip {
  id: string;
  name: string;
  /** The replay's prepared route with the trip's vehicle (its payload, the season's auxiliary power). */
  model: RouteModel;
  speedMps: Float64Array;
  startSoc: number;
  initialBrakeTempC: number;
  trip: AlignedTrip;
  /** Whether the trip's payload was logged or given (else `payloadKg` may be fitted for it). */
  payloadKnown: boolean;
}

export interface FittedParameter {
  key: FitParameter;
  initial: number;
  fitted: number;
  /** 95 % interval; null when the trips cannot determine it. */
  low: number | null;
  high: number | null;
  standardError: number | null;
  atBound: 'lower' | 'upper' | null;
}

export type CalibrationWarningCode =
  'indistinguishable' | 'ill_conditioned' | 'at_bound' | 'poorly_determined' | 'few_samples' | 'no_brake_data';

export interface CalibrationWarning {
  code: CalibrationWarningCode;
  message: string;
  parameters: FitParameter[];
}

export interface TripFit {
  loggedTripId: string;
  name: string;
  before: PowerComparison;
  after: PowerComparison;
  brakeBefore: ErrorStatistics | null;
  brakeAfter: ErrorStatistics | null;
  /** Steps of the replay with the fitted parameters; residual = measured − modelled. */
  residuals: { timeS: number[]; distanceM: number[]; measuredW: number[]; modelledW: number[]; residualW: number[] };
}

export interface FitStatistics {
  steps: number;
  effectiveSteps: number;
  lag1Autocorrelation: number;
  /** Duration-weighted residual standard deviation, W. */
  residualStdW: number;
  conditionNumber: number | null;
  iterations: number;
  tQuantile: number;
}

export interface CalibrationOutcome {
  parameters: FittedParameter[];
  correlation: { keys: FitParameter[]; matrix: number[][] } | null;
  warnings: CalibrationWarning[];
  before: PowerComparison;
  after: PowerComparison;
  trips: TripFit[];
  brake: { parameters: FittedParameter[]; before: ErrorStatistics; after: ErrorStatistics; correlation: number | null } | null;
  statistics: FitStatistics;
  /** The fitted road load as F = A + B·v + C·v² (SAE J1263 / J2263 form, B = 0 here) at the trips' mean mass. */
  roadLoad: { massKg: number; aN: number; bNPerMps: number; cNPerMps2: number; airDensityKgM3: number };
}

export interface CalibrationInput {
  trips: CalibrationTrip[];
  parameters: FitParameter[];
}

export interface FitOptions {
  /** Called between rounds of iterations, e.g. to let other work run. */
  pause?: () => Promise<void>;
  /** Most Levenberg–Marquardt iterations in all (default 60). */
  maxIterations?: number;
}

/** Vehicle of one trip with parameter values applied. */
export function vehicleWithParameters(base: Vehicle, values: Partial<Record<FitParameter, number>>, payloadKnown: boolean): Vehicle {
  const vehicle = { ...base };
  for (const [key, value] of Object.entries(values) as [FitParameter, number][]) {
    switch (key) {
      case 'dragAreaM2':
        vehicle.dragCoefficient = value / vehicle.frontalAreaM2;
        break;
      case 'payloadKg':
        if (!payloadKnown) vehicle.payloadKg = value;
        break;
      default:
        vehicle[key] = value;
    }
  }
  return vehicle;
}

/** The value of a parameter in a vehicle. */
export function parameterValue(vehicle: Vehicle, key: FitParameter): number {
  return key === 'dragAreaM2' ? vehicle.dragCoefficient * vehicle.frontalAreaM2 : vehicle[key];
}

function runTrip(trip: CalibrationTrip, values: Partial<Record<FitParameter, number>>): RouteRun {
  const vehicle = vehicleWithParameters(trip.model.vehicle, values, trip.payloadKnown);
  return runRoute(withVehicle(trip.model, vehicle), trip.speedMps, trip.startSoc, trip.initialBrakeTempC);
}

function stepsOf(trip: CalibrationTrip, values: Partial<Record<FitParameter, number>>): ReplaySteps {
  const vehicle = vehicleWithParameters(trip.model.vehicle, values, trip.payloadKnown);
  const model = withVehicle(trip.model, vehicle);
  const steps = replaySteps(model, runRoute(model, trip.speedMps, trip.startSoc, trip.initialBrakeTempC), trip.trip);
  if (!steps) throw new RangeError(`trip ${trip.name} has no battery power to fit on`);
  return steps;
}

/** Fits the vehicle per the module comment. */
export async function fitCalibration(input: CalibrationInput, options: FitOptions = {}): Promise<CalibrationOutcome> {
  const { trips } = input;
  if (trips.length === 0) throw new RangeError('fit: give at least one trip');
  const powerKeys = POWER_FIT_PARAMETERS.filter(
    (key) => input.parameters.includes(key) && (key !== 'payloadKg' || trips.some((t) => !t.payloadKnown)),
  );
  const brakeKeys = BRAKE_FIT_PARAMETERS.filter((key) => input.parameters.includes(key));
  const reference = trips[0]!.model.vehicle;
  const initialValues = (keys: readonly FitParameter[]) => {
    const unknown = trips.find((t) => !t.payloadKnown);
    return keys.map((key) => (key === 'payloadKg' && unknown ? unknown.model.vehicle.payloadKg : parameterValue(reference, key)));
  };

  const beforeSteps = trips.map((trip) => stepsOf(trip, {}));
  const measured = concat(beforeSteps.map((s) => s.measuredW));
  const durations = concat(beforeSteps.map((s) => s.durationS));
  const groups = concat(beforeSteps.map((s, index) => new Float64Array(s.measuredW.length).fill(index)));
  const warnings: CalibrationWarning[] = [];

  const power = await boundedLeastSquares(
    {
      keys: powerKeys,
      initial: initialValues(powerKeys),
      measured,
      weights: durations,
      groups,
      responseScale: 10_000,
      evaluate: (theta) => concat(trips.map((trip) => stepsOf(trip, record(powerKeys, theta)).modelledW)),
    },
    options,
  );
  let fittedPower = record(powerKeys, power.theta);
  warnings.push(...power.warnings);

  let brake: CalibrationOutcome['brake'] = null;
  let fittedBrake: Partial<Record<FitParameter, number>> = {};
  let parameters = power.parameters;
  let correlation: CalibrationOutcome['correlation'] = power.correlation ? { keys: [...powerKeys], matrix: power.correlation } : null;
  let statistics = power.statistics;
  if (brakeKeys.length > 0) {
    const withBrakes = trips.filter((trip) => trip.trip.brakeTempC?.some((value) => value !== null));
    if (withBrakes.length === 0) {
      warnings.push({
        code: 'no_brake_data',
        message: 'No chosen trip logged brake temperatures, so the brake thermal parameters were left as they are.',
        parameters: brakeKeys,
      });
    } else {
      const measuredC: number[] = [];
      const pointsOf = withBrakes.map((trip) => trip.trip.brakeTempC!.map((value, i) => (value === null ? -1 : i)).filter((i) => i >= 0));
      withBrakes.forEach((trip, t) => pointsOf[t]!.forEach((i) => measuredC.push(trip.trip.brakeTempC![i]!)));
      const brakeGroups = concat(pointsOf.map((points, t) => new Float64Array(points.length).fill(trips.length + t)));
      const brakeTemperatures = (values: Partial<Record<FitParameter, number>>) => {
        const out: number[] = [];
        withBrakes.forEach((trip, t) => {
          const run = runTrip(trip, values);
          for (const i of pointsOf[t]!) out.push(run.brakeTempC[i]!);
        });
        return Float64Array.from(out);
      };
      const measuredArray = Float64Array.from(measuredC);
      // Brake parameters alone first, the powertrain held at its fit: a start for the joint fit
      // and the scatter of the brake temperatures.
      const alone = await boundedLeastSquares(
        {
          keys: brakeKeys,
          initial: initialValues(brakeKeys),
          measured: measuredArray,
          weights: new Float64Array(measuredC.length).fill(1),
          groups: brakeGroups,
          responseScale: 10,
          evaluate: (theta) => brakeTemperatures({ ...fittedPower, ...record(brakeKeys, theta) }),
        },
        options,
      );
      // Then everything together, each kind of residual scaled by its own scatter, so the brake
      // intervals carry the uncertainty of the regeneration that decides the friction heat.
      const keys = [...powerKeys, ...brakeKeys];
      const sigmaPowerW = Math.max(power.statistics.residualStdW, 1);
      const sigmaBrakeC = Math.max(alone.statistics.residualStdW, 0.01);
      const meanDuration = durations.reduce((a, b) => a + b, 0) / Math.max(1, durations.length);
      const joint = await boundedLeastSquares(
        {
          keys,
          initial: [...power.theta, ...alone.theta],
          measured: concat([measured, measuredArray]),
          weights: concat([
            Float64Array.from(durations, (d) => d / meanDuration / sigmaPowerW ** 2),
            new Float64Array(measuredC.length).fill(1 / sigmaBrakeC ** 2),
          ]),
          groups: concat([groups, brakeGroups]),
          responseScale: 1,
          evaluate: (theta) => {
            const values = record(keys, theta);
            return concat([concat(trips.map((trip) => stepsOf(trip, values).modelledW)), brakeTemperatures(values)]);
          },
        },
        options,
      );
      warnings.length = 0;
      warnings.push(
        ...joint.warnings.filter((warning) => warning.code !== 'few_samples' || power.warnings.some((w) => w.code === 'few_samples')),
      );
      fittedPower = record(powerKeys, joint.theta.slice(0, powerKeys.length));
      fittedBrake = record(brakeKeys, joint.theta.slice(powerKeys.length));
      parameters = joint.parameters.slice(0, powerKeys.length);
      correlation = joint.correlation ? { keys, matrix: joint.correlation } : null;
      statistics = {
        ...power.statistics,
        conditionNumber: joint.statistics.conditionNumber,
        iterations: power.statistics.iterations + alone.statistics.iterations + joint.statistics.iterations,
        tQuantile: joint.statistics.tQuantile,
      };
      const stats = (values: Float64Array) => comparePointValues(Array.from(measuredArray), values)!;
      const brakeIndex = (key: FitParameter) => keys.indexOf(key);
      brake = {
        parameters: joint.parameters.slice(powerKeys.length),
        before: stats(brakeTemperatures({})),
        after: stats(brakeTemperatures({ ...fittedPower, ...fittedBrake })),
        correlation:
          joint.correlation && brakeKeys.length === 2 ? joint.correlation[brakeIndex(brakeKeys[0]!)]![brakeIndex(brakeKeys[1]!)]! : null,
      };
    }
  }

  const allFitted = { ...fittedPower, ...fittedBrake };
  const tripFits: TripFit[] = trips.map((trip, index) => {
    const run = runTrip(trip, allFitted);
    const model = withVehicle(trip.model, vehicleWithParameters(trip.model.vehicle, allFitted, trip.payloadKnown));
    const after = replaySteps(model, run, trip.trip)!;
    const beforeRun = runTrip(trip, {});
    const brakeMeasured = trip.trip.brakeTempC;
    return {
      loggedTripId: trip.id,
      name: trip.name,
      before: comparePower([beforeSteps[index]!]),
      after: comparePower([after]),
      brakeBefore: brakeMeasured ? comparePointValues(brakeMeasured, beforeRun.brakeTempC) : null,
      brakeAfter: brakeMeasured ? comparePointValues(brakeMeasured, run.brakeTempC) : null,
      residuals: {
        timeS: Array.from(after.timeS),
        distanceM: Array.from(after.distanceM),
        measuredW: Array.from(after.measuredW),
        modelledW: Array.from(after.modelledW),
        residualW: Array.from(after.measuredW, (value, k) => value - after.modelledW[k]!),
      },
    };
  });
  const afterSteps = tripFits.map((fit) => ({
    measuredW: Float64Array.from(fit.residuals.measuredW),
    modelledW: Float64Array.from(fit.residuals.modelledW),
    durationS: beforeSteps[tripFits.indexOf(fit)]!.durationS,
    distanceM: Float64Array.from(fit.residuals.distanceM),
    timeS: Float64Array.from(fit.residuals.timeS),
  }));

  const meanMassKg =
    trips.reduce((sum, trip) => {
      const vehicle = vehicleWithParameters(trip.model.vehicle, allFitted, trip.payloadKnown);
      return sum + vehicle.curbMassKg + vehicle.payloadKg;
    }, 0) / trips.length;
  const fittedReference = vehicleWithParameters(reference, allFitted, true);
  return {
    parameters,
    correlation,
    warnings,
    before: comparePower(beforeSteps),
    after: comparePower(afterSteps),
    trips: tripFits,
    brake,
    statistics,
    roadLoad: {
      massKg: meanMassKg,
      aN: fittedReference.rollingResistanceCoefficient * meanMassKg * STANDARD_GRAVITY_MPS2,
      bNPerMps: 0,
      cNPerMps2: 0.5 * ROAD_LOAD_REFERENCE_AIR_DENSITY_KG_M3 * parameterValue(fittedReference, 'dragAreaM2'),
      airDensityKgM3: ROAD_LOAD_REFERENCE_AIR_DENSITY_KG_M3,
    },
  };
}

interface LeastSquaresProblem {
  keys: readonly FitParameter[];
  initial: number[];
  measured: Float64Array;
  /** Weight of each residual (durations; scaled to a mean of one inside). */
  weights: Float64Array;
  /** Which series (trip) each residual belongs to, for the lag-1 autocorrelation. */
  groups: Float64Array;
  /** Typical size of the response, to keep the damping meaningful (W or °C). */
  responseScale: number;
  evaluate: (theta: number[]) => Float64Array;
}

interface LeastSquaresResult {
  theta: number[];
  modelled: Float64Array;
  parameters: FittedParameter[];
  correlation: number[][] | null;
  warnings: CalibrationWarning[];
  statistics: FitStatistics;
}

const ROUND_ITERATIONS = 5;

async function boundedLeastSquares(problem: LeastSquaresProblem, options: FitOptions): Promise<LeastSquaresResult> {
  const { keys, measured } = problem;
  const p = keys.length;
  const n = measured.length;
  const meanWeight = problem.weights.reduce((a, b) => a + b, 0) / Math.max(1, n);
  const weights = Float64Array.from(problem.weights, (w) => w / meanWeight);
  const rootWeights = Float64Array.from(weights, Math.sqrt);
  const scale = problem.initial.map((value, i) => (Math.abs(value) > 1e-9 ? Math.abs(value) : typicalScale(keys[i]!)));
  const lower = keys.map((key, i) => FIT_BOUNDS[key][0] / scale[i]!);
  const upper = keys.map((key, i) => FIT_BOUNDS[key][1] / scale[i]!);
  const toTheta = (x: number[]) => x.map((value, i) => value * scale[i]!);

  let cacheKey = '';
  let cacheValue: Float64Array = new Float64Array(0);
  const model = (x: number[]) => {
    const key = x.join(',');
    if (key !== cacheKey) {
      cacheValue = problem.evaluate(toTheta(x));
      cacheKey = key;
    }
    return cacheValue;
  };
  const data = {
    x: Array.from({ length: n }, (_, i) => i),
    y: Array.from(measured, (value, i) => (rootWeights[i]! * value) / problem.responseScale),
  };
  const parameterized = (x: number[]) => {
    const values = model(x);
    return (i: number) => (rootWeights[i]! * values[i]!) / problem.responseScale;
  };

  let x = problem.initial.map((value, i) => Math.min(upper[i]!, Math.max(lower[i]!, value / scale[i]!)));
  let iterations = 0;
  let previousError = sumSquares(data.y, parameterized(x));
  const maxIterations = options.maxIterations ?? 60;
  while (p > 0 && iterations < maxIterations) {
    const result = levenbergMarquardt(data, parameterized, {
      initialValues: x,
      minValues: lower,
      maxValues: upper,
      maxIterations: ROUND_ITERATIONS,
      gradientDifference: 1e-4,
      errorTolerance: 0,
    });
    iterations += ROUND_ITERATIONS;
    const error = sumSquares(data.y, parameterized(result.parameterValues));
    const improved = error < previousError;
    if (improved) x = result.parameterValues;
    const gain = (previousError - error) / Math.max(previousError, 1e-300);
    if (improved) previousError = error;
    await options.pause?.();
    if (!improved || gain < 1e-8) break;
  }
  const theta = toTheta(x);
  const modelled = Float64Array.from(model(x));

  // Linearised covariance at the solution (module comment).
  const residuals = Float64Array.from(measured, (value, i) => value - modelled[i]!);
  let ss = 0;
  for (let i = 0; i < n; i++) ss += weights[i]! * residuals[i]! ** 2;
  let lagSum = 0;
  let lagNorm = 0;
  for (let i = 0; i < n; i++) {
    const wr = rootWeights[i]! * residuals[i]!;
    lagNorm += wr * wr;
    if (i + 1 < n && problem.groups[i + 1] === problem.groups[i]) lagSum += wr * rootWeights[i + 1]! * residuals[i + 1]!;
  }
  const rho = lagNorm > 0 ? Math.min(0.99, Math.max(0, lagSum / lagNorm)) : 0;
  const inflation = (1 + rho) / (1 - rho);
  const effectiveSteps = n / inflation;
  const dof = Math.max(1, Math.floor(effectiveSteps - p));
  const sigmaSq = ss / Math.max(1, n - p);
  const t = tQuantile975(dof);

  const jacobian = new Matrix(n, p);
  for (let j = 0; j < p; j++) {
    const h = 1e-4 * scale[j]!;
    const plus = [...theta];
    const minus = [...theta];
    plus[j] = Math.min(FIT_BOUNDS[keys[j]!][1], theta[j]! + h);
    minus[j] = Math.max(FIT_BOUNDS[keys[j]!][0], theta[j]! - h);
    const fPlus = problem.evaluate(plus);
    const fMinus = problem.evaluate(minus);
    const span = plus[j]! - minus[j]!;
    for (let i = 0; i < n; i++) jacobian.set(i, j, (rootWeights[i]! * (fPlus[i]! - fMinus[i]!)) / span);
  }
  const normal = jacobian.transpose().mmul(jacobian);
  const diagonal = Array.from({ length: p }, (_, j) => Math.sqrt(Math.max(normal.get(j, j), 0)));
  let covariance: Matrix | null = null;
  let conditionNumber: number | null = null;
  if (p > 0 && diagonal.every((d) => d > 0)) {
    const scaled = new Matrix(p, p);
    for (let a = 0; a < p; a++) for (let b = 0; b < p; b++) scaled.set(a, b, normal.get(a, b) / (diagonal[a]! * diagonal[b]!));
    const eigenvalues = new EigenvalueDecomposition(scaled, { assumeSymmetric: true }).realEigenvalues;
    const largest = Math.max(...eigenvalues);
    const smallest = Math.min(...eigenvalues);
    conditionNumber = smallest > 0 ? largest / smallest : Number.POSITIVE_INFINITY;
    if (smallest > largest * 1e-14) {
      const scaledInverse = inverse(scaled);
      covariance = new Matrix(p, p);
      for (let a = 0; a < p; a++) {
        for (let b = 0; b < p; b++) covariance.set(a, b, (sigmaSq * inflation * scaledInverse.get(a, b)) / (diagonal[a]! * diagonal[b]!));
      }
    }
  }

  const parameters: FittedParameter[] = keys.map((key, j) => {
    const [min, max] = FIT_BOUNDS[key];
    const se = covariance ? Math.sqrt(Math.max(0, covariance.get(j, j))) : null;
    const atBound = theta[j]! <= min * (1 + 1e-6) + 1e-12 ? 'lower' : theta[j]! >= max * (1 - 1e-6) ? 'upper' : null;
    return {
      key,
      initial: problem.initial[j]!,
      fitted: theta[j]!,
      low: se === null ? null : Math.max(min, theta[j]! - t * se),
      high: se === null ? null : Math.min(max, theta[j]! + t * se),
      standardError: se,
      atBound,
    };
  });
  const correlation = covariance
    ? keys.map((_, a) => keys.map((__, b) => covariance!.get(a, b) / Math.sqrt(covariance!.get(a, a) * covariance!.get(b, b))))
    : null;

  const warnings: CalibrationWarning[] = [];
  if (p > 0 && !covariance) {
    warnings.push({
      code: 'ill_conditioned',
      message: `The trips cannot determine ${keys.map(label).join(', ')} together: the fit has no unique answer. Add trips that differ in speed, grade and braking, or fit fewer parameters.`,
      parameters: [...keys],
    });
  } else if (conditionNumber !== null && conditionNumber > ILL_CONDITIONED_ABOVE) {
    warnings.push({
      code: 'ill_conditioned',
      message: `The fit is ill-conditioned (condition number ${conditionNumber.toExponential(1)}): some combination of the parameters is barely determined by these trips.`,
      parameters: [...keys],
    });
  }
  if (correlation) {
    for (let a = 0; a < p; a++) {
      for (let b = a + 1; b < p; b++) {
        const r = correlation[a]![b]!;
        if (Math.abs(r) >= INDISTINGUISHABLE_CORRELATION) {
          warnings.push({ code: 'indistinguishable', message: indistinguishable(keys[a]!, keys[b]!, r), parameters: [keys[a]!, keys[b]!] });
        }
      }
    }
  }
  for (const parameter of parameters) {
    if (parameter.atBound) {
      warnings.push({
        code: 'at_bound',
        message: `${label(parameter.key)} stopped at its ${parameter.atBound} search limit (${FIT_BOUNDS[parameter.key][parameter.atBound === 'lower' ? 0 : 1]}); the trips push it beyond what is physical, which usually means a measurement or another parameter is off.`,
        parameters: [parameter.key],
      });
    } else if (parameter.standardError !== null && t * parameter.standardError > 0.5 * Math.abs(parameter.fitted)) {
      warnings.push({
        code: 'poorly_determined',
        message: `${label(parameter.key)} is poorly determined by these trips (95 % interval wider than ±50 % of the value).`,
        parameters: [parameter.key],
      });
    }
  }
  if (p > 0 && effectiveSteps < 10 * p) {
    warnings.push({
      code: 'few_samples',
      message: `Only about ${Math.round(effectiveSteps)} independent steps for ${p} parameters; longer or more trips make the intervals trustworthy.`,
      parameters: [...keys],
    });
  }

  return {
    theta,
    modelled,
    parameters,
    correlation,
    warnings,
    statistics: {
      steps: n,
      effectiveSteps,
      lag1Autocorrelation: rho,
      residualStdW: Math.sqrt(sigmaSq),
      conditionNumber,
      iterations,
      tQuantile: t,
    },
  };
}

function sumSquares(y: number[], f: (i: number) => number): number {
  let sum = 0;
  for (let i = 0; i < y.length; i++) sum += (y[i]! - f(i)) ** 2;
  return sum;
}

function typicalScale(key: FitParameter): number {
  return key === 'auxPowerW' ? 10_000 : key === 'payloadKg' ? 2_000 : 1;
}

function record(keys: readonly FitParameter[], values: number[]): Partial<Record<FitParameter, number>> {
  return Object.fromEntries(keys.map((key, i) => [key, values[i]!]));
}

function concat(arrays: Float64Array[]): Float64Array {
  const out = new Float64Array(arrays.reduce((n, a) => n + a.length, 0));
  let offset = 0;
  for (const array of arrays) {
    out.set(array, offset);
    offset += array.length;
  }
  return out;
}

function label(key: FitParameter): string {
  return FIT_PARAMETER_LABELS[key];
}

function indistinguishable(a: FitParameter, b: FitParameter, r: number): string {
  const pair = new Set([a, b]);
  const base = `${label(a)} and ${label(b).toLowerCase()} cannot be told apart by these trips (correlation ${r.toFixed(2)}).`;
  if (pair.has('rollingResistanceCoefficient') && pair.has('dragAreaM2')) {
    return `${base} Rolling resistance grows with speed, drag with its cube: trips at nearly one speed cannot separate them. Add trips at other speeds, or keep one of the two fixed.`;
  }
  if (pair.has('drivetrainEfficiency')) {
    return `${base} Both scale the power drawn while driving; trips with more varied climbing, braking and standing separate them.`;
  }
  return `${base} Keep one of them fixed, or add trips in other conditions.`;
}

/**
 * Two-sided 95 % quantile of Student's t with ν degrees of freedom: the standard table for
 * ν ≤ 30 (common practice; any statistics handbook), interpolated in 1/ν towards 1.960 beyond.
 */
export function tQuantile975(dof: number): number {
  const table = [
    12.706, 4.303, 3.182, 2.776, 2.571, 2.447, 2.365, 2.306, 2.262, 2.228, 2.201, 2.179, 2.16, 2.145, 2.131, 2.12, 2.11, 2.101, 2.093,
    2.086, 2.08, 2.074, 2.069, 2.064, 2.06, 2.056, 2.052, 2.048, 2.045, 2.042,
  ];
  if (dof <= 30) return table[Math.max(1, Math.round(dof)) - 1]!;
  const tail: [number, number][] = [
    [30, 2.042],
    [40, 2.021],
    [60, 2.0],
    [120, 1.98],
    [Number.POSITIVE_INFINITY, 1.96],
  ];
  for (let i = 0; i < tail.length - 1; i++) {
    const [d0, t0] = tail[i]!;
    const [d1, t1] = tail[i + 1]!;
    if (dof <= d1) {
      const f = (1 / d0 - 1 / dof) / (1 / d0 - (d1 === Number.POSITIVE_INFINITY ? 0 : 1 / d1));
      return t0 + f * (t1 - t0);
    }
  }
  return 1.96;
}
