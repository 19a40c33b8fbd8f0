/**
 * A service day: every block (one vehicle's day) simulated through the day with the same engine
 * as a single trip, carrying the battery's SOC and the brakes' temperatures from one trip to the
 * next.
 *
 * - Pull-out: the block leaves the depot at its `startSoc` (a depot charger named by the block
 *   has charged it there overnight; that charging is not part of the day).
 * - Trips: each trip is the prepared route of its route version and direction, run on its own
 *   minimum-time speed profile from the SOC and the brake temperatures the vehicle has when it
 *   leaves. A trip whose battery runs empty, or that the engine refuses, makes the block
 *   infeasible with a plain reason.
 * - Layovers (the gap between one trip's arrival and the next departure, and the stand between
 *   pull-out and the first departure): the vehicle stands; its auxiliaries draw from the battery,
 *   the brakes cool by the brake model's standstill law (still-air convection and radiation, no
 *   heat in). A charger within `CHARGER_REACH_M` of the trip's last point charges during the
 *   dwell less its connect time, at min(charger power × efficiency, the battery's charge limit at
 *   this SOC, ambient and battery age), and stops at the charger's target SOC. The charger also
 *   carries the auxiliaries while it is connected and the battery is at the target.
 * - Descents: each trip's descents are assessed with the worst credible case (descent-safety.ts)
 *   run from the brake temperatures the vehicle actually has when the trip leaves, and compared
 *   with the same descent run alone from a cold start; the day's peak is never reported cooler
 *   than the standalone one.
 *
 * Energy balance (exact by construction, checked by the tests): for every block,
 *   (startSoc − endSoc) × usable capacity + energy charged into the battery
 *     = Σ trips' and layovers' net battery energy (drawn minus regenerated).
 */
import type {
  AnalysisOptions,
  AnalysisOptionsInput,
  Conditions,
  LineString,
  RiskLevel,
  Surface,
  Vehicle,
  VehicleInput,
} from '../domain/analysis';
import { lineStringSchema, optionsSchema, vehicleSchema } from '../domain/analysis';
import * as z from 'zod';
import { blockSchema, chargerSchema, type BatteryAge, type Block, type BlockResult, type Charger } from '../domain/service-days';
import { prepareRouteModel, minimumTimeSpeeds, withVehicle } from './analyse-route';
import {
  DEFAULT_END_OF_LIFE_CAPACITY_FRACTION,
  DEFAULT_CLIMATE,
  ENGINE_VERSION,
  ENGINEERING_CAUTION,
  JOULES_PER_WH,
  MAX_RESAMPLED_POINTS,
  MAX_ROUTE_LENGTH_M,
} from './constants';
import { drivabilityStretches, runWorstCase } from './descent-safety';
import { brakeRiskLevel, findDescentRanges, type DescentRange } from './descents';
import { geodesicDistanceM } from './geodesy';
import { chargeTaperFactor, coldChargeFactor } from './powertrain';
import { resampleRoute } from './resample-route';
import { runRouteFrom, type RouteRun } from './route-run';
import {
  advanceSegment,
  dwell,
  emptySegmentResult,
  governingBrakeTempC,
  initialVehicleState,
  type RouteModel,
  type VehicleState,
} from './route-simulation';
import { auxiliaryBreakdown, preconditioningEnergyJ, tripAuxiliaryPowerW, type ClimateSettings } from './auxiliary-power';
import { assertInRange, EngineInputError, parseOrThrow } from './validation';

/** A charger serves a vehicle whose trip ends within this distance of it, m (engineering judgement: a terminus stand). */
export const CHARGER_REACH_M = 150;

/** Time step of charging and standing, s (short enough to follow the taper). */
export const STAND_STEP_S = 10;

/** Spacing of the SOC trace inside a trip, s. */
export const TRACE_STEP_S = 60;

/** One route version in one direction, prepared as the single-trip engine takes it. */
export interface ServiceDayRouteInput {
  routeId: string;
  /** Absent: the version every trip of this route without a version refers to. */
  routeVersion?: number;
  direction: 'outbound' | 'inbound';
  /** Display name for reasons ("Summit line outbound"). */
  name?: string;
  /** The line in the direction of travel; every position carries its elevation [lon, lat, z]. */
  route: LineString;
  /** Speed limits, stops with their dwell, spacing, smoothing and safety settings, as for a single trip. */
  options: AnalysisOptionsInput;
}

/** Payload of a trip's load. */
export type TripLoad = Block['trips'][number]['load'];

/** One vehicle profile as the engine needs it. */
export interface ServiceDayVehicleInput {
  vehicleProfileId: string;
  /** The engine vehicle; `payloadKg` is replaced per trip by its load, `auxPowerW` by the climate model when one is given. */
  vehicle: VehicleInput;
  loadsKg: { empty: number; seated: number; 'full-standing': number };
  passengerMassKg: number;
  /**
   * Auxiliary power from ambient, occupancy and doors (auxiliary-power.ts); fields left out take
   * `DEFAULT_CLIMATE`. Absent: the vehicle's constant `auxPowerW` all day, no pre-conditioning.
   */
  climate?: Partial<ClimateSettings>;
}

export interface ServiceDayEngineInput {
  /** Ambient air temperature of the season, °C. */
  ambientC: number;
  surface?: Surface;
  batteryAge: BatteryAge;
  /** Lowest SOC a block may reach, 0–1. */
  reserveSoc: number;
  routes: ServiceDayRouteInput[];
  vehicles: ServiceDayVehicleInput[];
  chargers: Charger[];
  blocks: Block[];
}

export interface ServiceDayEngineResult {
  engineVersion: string;
  blocks: BlockResult[];
  /** Peak grid power drawn by each charger at one time (vehicles charging there together summed), W. */
  peakChargingPowerW: { chargerKey: string; powerW: number }[];
  caution: string;
}

/** A route prepared for one vehicle and load (shared by every trip that runs it). */
interface PreparedTrip {
  route: ServiceDayRouteInput;
  options: AnalysisOptions;
  conditions: Conditions;
  model: RouteModel;
  speedMps: Float64Array;
  ranges: DescentRange[];
  /** Problems that keep the trip from being driven as drawn (empty when drivable). */
  notDrivable: string[];
  /** Worst-case model (descent-safety.ts) and the standalone peaks per descent, cold start. */
  worstModel: RouteModel;
  standalonePeakC: number[];
  /** Charger within reach of the last point, if any. */
  chargerAtEnd: Charger | undefined;
  /** Mean auxiliary power of the trip, W. */
  auxPowerW: number;
  /** Buffers of the day's runs of this trip (nominal and worst case). */
  series: TripSeries;
  worstSeries: TripSeries;
}

/** Runs every block of a service day. Input errors that concern the whole day throw `EngineInputError`. */
export function runServiceDay(rawInput: ServiceDayEngineInput): ServiceDayEngineResult {
  assertInRange('ambientC', rawInput.ambientC, -60, 60);
  assertInRange('reserveSoc', rawInput.reserveSoc, 0, 1);
  const input: ServiceDayEngineInput = {
    ...rawInput,
    chargers: parseOrThrow(z.array(chargerSchema), rawInput.chargers, 'chargers'),
    blocks: parseOrThrow(z.array(blockSchema), rawInput.blocks, 'blocks'),
  };
  const context = new DayContext(input);
  const blocks = input.blocks.map((block) => runBlock(context, block));
  return {
    engineVersion: ENGINE_VERSION,
    blocks,
    peakChargingPowerW: context.peakChargingPowerW(),
    caution: `${ENGINEERING_CAUTION} ${SERVICE_DAY_LIMITS}`,
  };
}

/** What a service-day run leaves out, said with every result. */
export const SERVICE_DAY_LIMITS =
  'The day is simulated on each route\u2019s planned speed profile: traffic, driver behaviour, runs to and from the depot, ' +
  'queueing at chargers and the battery\u2019s own temperature limits are not modelled.';

interface ParsedVehicle {
  input: ServiceDayVehicleInput;
  vehicle: Vehicle;
  climate: ClimateSettings | undefined;
  /** Auxiliary power while standing empty with the doors shut, W. */
  standAuxPowerW: number;
  /** Of it, the electrical power that heats the cabin, W. */
  standHeatingPowerW: number;
  /** Usable capacity and charge power at the day's battery age. */
  capacityJ: number;
  maxChargePowerW: number;
}

class DayContext {
  readonly vehicles = new Map<string, ParsedVehicle>();
  readonly chargers = new Map<string, Charger>();
  private readonly prepared = new Map<string, PreparedTrip | { error: string }>();
  private readonly routeGeometry = new Map<
    string,
    { resampled: ReturnType<typeof resampleRoute>; options: AnalysisOptions } | { error: string }
  >();
  /** Per charger: time-stamped changes of grid power, W. */
  private readonly gridSteps = new Map<string, { timeS: number; deltaW: number }[]>();

  constructor(readonly input: ServiceDayEngineInput) {
    input.vehicles.forEach((entry, index) => {
      const parsed = vehicleSchema.safeParse(entry.vehicle);
      if (!parsed.success) {
        const issue = parsed.error.issues[0]!;
        throw new EngineInputError(`vehicles.${index}.vehicle.${issue.path.join('.')}`, issue.message);
      }
      const vehicle = parsed.data;
      const capacityShare =
        input.batteryAge === 'end-of-life' ? (vehicle.endOfLifeCapacityFraction ?? DEFAULT_END_OF_LIFE_CAPACITY_FRACTION) : 1;
      const chargeShare = input.batteryAge === 'end-of-life' ? (vehicle.endOfLifeChargePowerFraction ?? 1) : 1;
      const aged: Vehicle = {
        ...vehicle,
        batteryCapacityWh: vehicle.batteryCapacityWh * capacityShare,
        maxChargePowerW: vehicle.maxChargePowerW * chargeShare,
      };
      const climate = entry.climate ? { ...DEFAULT_CLIMATE, ...entry.climate } : undefined;
      const standing = climate
        ? auxiliaryBreakdown(climate, { ambientC: input.ambientC, passengers: 0, doorOpenings: 0, durationS: 3_600 })
        : undefined;
      this.vehicles.set(entry.vehicleProfileId, {
        input: entry,
        vehicle: aged,
        climate,
        standAuxPowerW: standing ? standing.totalW : aged.auxPowerW,
        standHeatingPowerW: standing ? standing.heatPumpElectricW + standing.resistiveElectricW : 0,
        capacityJ: aged.batteryCapacityWh * JOULES_PER_WH,
        maxChargePowerW: aged.maxChargePowerW,
      });
    });
    for (const charger of input.chargers) this.chargers.set(charger.key, charger);
  }

  /** The route input a trip refers to. */
  routeFor(trip: Block['trips'][number]): ServiceDayRouteInput | undefined {
    const candidates = this.input.routes.filter((route) => route.routeId === trip.routeId && route.direction === trip.direction);
    if (trip.routeVersion !== undefined)
      return candidates.find((route) => route.routeVersion === undefined || route.routeVersion === trip.routeVersion);
    return candidates[0];
  }

  /** Prepares (once) a route for a vehicle and a load. */
  prepare(route: ServiceDayRouteInput, vehicle: ParsedVehicle, load: TripLoad): PreparedTrip | { error: string } {
    const payloadKg = load.kind === 'case' ? vehicle.input.loadsKg[load.case] : load.passengers * vehicle.input.passengerMassKg;
    const key = `${route.routeId}|${route.routeVersion ?? ''}|${route.direction}|${vehicle.input.vehicleProfileId}|${payloadKg}`;
    const cached = this.prepared.get(key);
    if (cached) return cached;
    let result: PreparedTrip | { error: string };
    try {
      result = this.prepareUncached(route, vehicle, payloadKg);
    } catch (error) {
      if (!(error instanceof EngineInputError)) throw error;
      result = { error: `the calculation refused an input: ${error.message}` };
    }
    this.prepared.set(key, result);
    return result;
  }

  private geometry(route: ServiceDayRouteInput) {
    const key = `${route.routeId}|${route.routeVersion ?? ''}|${route.direction}`;
    let entry = this.routeGeometry.get(key);
    if (entry) return entry;
    const line = lineStringSchema.safeParse(route.route);
    const options = optionsSchema.safeParse(route.options);
    if (!line.success) entry = { error: `the route line is not valid: ${line.error.issues[0]!.message}` };
    else if (!options.success)
      entry = {
        error: `the route's settings are not valid: ${options.error.issues[0]!.path.join('.')} ${options.error.issues[0]!.message}`,
      };
    else {
      const resampled = resampleRoute(line.data.coordinates, options.data.spacingM, {
        maxLengthM: MAX_ROUTE_LENGTH_M,
        maxPoints: MAX_RESAMPLED_POINTS,
      });
      entry = resampled.elevationM ? { resampled, options: options.data } : { error: 'the route\u2019s positions carry no elevation' };
    }
    this.routeGeometry.set(key, entry);
    return entry;
  }

  private prepareUncached(route: ServiceDayRouteInput, parsed: ParsedVehicle, payloadKg: number): PreparedTrip | { error: string } {
    const geometry = this.geometry(route);
    if ('error' in geometry) return geometry;
    const { resampled, options } = geometry;
    const input = this.input;
    const passengers = parsed.input.passengerMassKg > 0 ? payloadKg / parsed.input.passengerMassKg : 0;
    const stopCount = options.stops.length;
    const conditions: Conditions = { ambientC: input.ambientC, startSoc: 0.8, surface: input.surface ?? 'dry' };
    const baseVehicle: Vehicle = { ...parsed.vehicle, payloadKg };
    const model0 = prepareRouteModel(baseVehicle, conditions, options, resampled, resampled.elevationM!);
    const speedMps = minimumTimeSpeeds(model0, baseVehicle, options);
    let durationS = 0;
    for (let k = 0; k < model0.pointCount - 1; k++) {
      const v = speedMps[k]! + speedMps[k + 1]!;
      durationS += v > 0 ? (2 * model0.slopeLengthM[k]!) / v : 0;
    }
    for (let i = 0; i < model0.pointCount; i++) durationS += model0.dwellS[i]!;
    const climate = parsed.climate;
    const auxPowerW = climate
      ? tripAuxiliaryPowerW(climate, { ambientC: input.ambientC, passengers, doorOpenings: stopCount, durationS })
      : parsed.vehicle.auxPowerW;
    const model = withVehicle(model0, { ...baseVehicle, auxPowerW });
    const coldRun = runRouteFrom(model, speedMps, initialVehicleState(conditions.startSoc, input.ambientC));
    const notDrivable = drivabilityStretches(model, coldRun, options)
      .filter((stretch) => stretch.reason !== 'crawl')
      .map((stretch) => `${km(stretch.fromM)}–${km(stretch.toM)} km: ${stretch.detail}`);
    const ranges = findDescentRanges(model, options);
    const worst = runWorstCase(model, coldRun, conditions, options.safety);
    const standalonePeakC = ranges.map((range) => Math.max(peakOver(worst.run, range), peakOver(coldRun, range)));
    const n = model.pointCount;
    const end: [number, number] = [model.lon[n - 1]!, model.lat[n - 1]!];
    let chargerAtEnd: Charger | undefined;
    let nearest = Number.POSITIVE_INFINITY;
    for (const charger of input.chargers) {
      const d = geodesicDistanceM(end[0], end[1], charger.position[0], charger.position[1]);
      if (d <= CHARGER_REACH_M && d < nearest) {
        nearest = d;
        chargerAtEnd = charger;
      }
    }
    return {
      route,
      options,
      conditions,
      model,
      speedMps,
      ranges,
      notDrivable,
      worstModel: worst.model,
      standalonePeakC,
      chargerAtEnd,
      auxPowerW,
      series: tripSeries(model.pointCount),
      worstSeries: tripSeries(model.pointCount),
    };
  }

  recordGridPower(chargerKey: string, startS: number, endS: number, powerW: number): void {
    if (!(powerW > 0) || !(endS > startS)) return;
    let steps = this.gridSteps.get(chargerKey);
    if (!steps) this.gridSteps.set(chargerKey, (steps = []));
    steps.push({ timeS: startS, deltaW: powerW }, { timeS: endS, deltaW: -powerW });
  }

  peakChargingPowerW(): { chargerKey: string; powerW: number }[] {
    const out: { chargerKey: string; powerW: number }[] = [];
    for (const charger of this.input.chargers) {
      const steps = this.gridSteps.get(charger.key) ?? [];
      // Ends before starts at the same instant: one vehicle leaving as another arrives is not a peak.
      steps.sort((a, b) => a.timeS - b.timeS || a.deltaW - b.deltaW);
      let level = 0;
      let peak = 0;
      for (const step of steps) {
        level += step.deltaW;
        if (level > peak) peak = level;
      }
      out.push({ chargerKey: charger.key, powerW: peak });
    }
    return out;
  }
}

export { DEFAULT_END_OF_LIFE_CAPACITY_FRACTION };

function peakOver(run: RouteRun, range: DescentRange): number {
  let peak = Number.NEGATIVE_INFINITY;
  for (let i = range.firstSegment; i <= range.lastSegment + 1; i++) {
    peak = Math.max(peak, run.brakeTempC[i]!, run.frontBrakeTempC[i]!, run.rearBrakeTempC[i]!);
  }
  return peak;
}

/** Per-point series a day's trip run keeps (reused from trip to trip: a day runs hundreds). */
export interface TripSeries {
  timeS: Float64Array;
  soc: Float64Array;
  /** Hotter of the brake lump and the two brake groups, °C. */
  governingC: Float64Array;
}

export function tripSeries(pointCount: number): TripSeries {
  return { timeS: new Float64Array(pointCount), soc: new Float64Array(pointCount), governingC: new Float64Array(pointCount) };
}

/**
 * One trip from `state` (updated to the end state), exactly as `runRouteFrom` steps it (the same
 * segment and dwell steps in the same order) but keeping only time, SOC and the governing brake
 * temperature per point. Answers the energy drawn (sourceJ), the run time, and the braking energy
 * regenerated (at the battery or line terminals, as the single-trip summary counts it) and taken by
 * the friction brakes, so the day's figures add up the same way a scenario's do.
 */
export function runTrip(
  model: RouteModel,
  speedMps: Float64Array,
  state: VehicleState,
  out: TripSeries,
  lastPoint = model.pointCount - 1,
): { sourceJ: number; durationS: number; regenJ: number; frictionJ: number } {
  const n = lastPoint + 1;
  const segments = lastPoint;
  const result = emptySegmentResult();
  let timeS = 0;
  let sourceJ = 0;
  let regenJ = 0;
  let frictionJ = 0;
  for (let i = 0; i < n; i++) {
    out.timeS[i] = timeS;
    out.soc[i] = state.soc;
    out.governingC[i] = governingBrakeTempC(state);
    const dwellS = model.dwellS[i]!;
    if (dwellS > 0) {
      dwell(model, i, dwellS, state, result);
      timeS += dwellS;
      sourceJ += result.split.sourcePowerW * dwellS;
    }
    if (i === segments) break;
    advanceSegment(model, i, speedMps[i]!, speedMps[i + 1]!, state, result);
    timeS += result.durationS;
    sourceJ += result.split.sourcePowerW * result.durationS;
    regenJ += result.split.regenElectricPowerW * result.durationS;
    frictionJ += result.split.frictionPowerW * result.durationS;
  }
  return { sourceJ, durationS: timeS, regenJ, frictionJ };
}

function seriesPeak(series: TripSeries, range: DescentRange): number {
  let peak = Number.NEGATIVE_INFINITY;
  for (let i = range.firstSegment; i <= range.lastSegment + 1; i++) peak = Math.max(peak, series.governingC[i]!);
  return peak;
}

const RISK_RANK: Record<RiskLevel, number> = { low: 0, elevated: 1, high: 2, critical: 3 };

/** Simulates one block (module comment). */
function runBlock(context: DayContext, block: Block): BlockResult {
  const problems: string[] = [];
  const socTrace: { timeS: number; soc: number }[] = [];
  const chargingEvents: BlockResult['chargingEvents'] = [];
  const descents: BlockResult['descents'] = [];
  const parsed = context.vehicles.get(block.vehicleProfileId);
  const empty = (reason: string): BlockResult => ({
    blockId: block.blockId,
    minSoc: block.startSoc,
    endSoc: block.startSoc,
    chargedEnergyWh: 0,
    tripNetEnergyWh: 0,
    regenEnergyWh: 0,
    frictionBrakeEnergyWh: 0,
    feasible: false,
    problems: [reason],
    socTrace: [{ timeS: block.pullOutS, soc: block.startSoc }],
    chargingEvents: [],
    descents: [],
  });
  if (!parsed) return empty(`vehicle profile ${block.vehicleProfileId} was not given to the calculation`);
  const capacityJ = parsed.capacityJ;
  const isBattery = parsed.vehicle.powerSource === 'battery' && capacityJ > 0;
  const state: VehicleState = initialVehicleState(block.startSoc, context.input.ambientC);
  let timeS = block.pullOutS;
  let netJ = 0;
  let chargedJ = 0;
  let regenJ = 0;
  let frictionJ = 0;
  let minSoc = block.startSoc;
  let minSocAtS = timeS;
  let tripAuxJ = 0;
  let tripAuxS = 0;
  let tripAuxMaxW = 0;
  const note = (t: number, soc: number) => {
    const last = socTrace[socTrace.length - 1];
    if (last && last.timeS === t && last.soc === soc) return;
    socTrace.push({ timeS: t, soc });
    if (soc < minSoc) {
      minSoc = soc;
      minSocAtS = t;
    }
  };
  let depot: Charger | undefined;
  if (block.depotChargerKey !== undefined) {
    depot = context.chargers.get(block.depotChargerKey);
    if (!depot) problems.push(`the depot charger \u201c${block.depotChargerKey}\u201d is not among the service day\u2019s chargers`);
  }
  // Pre-conditioning before pull-out: from the depot charger when the block names one, else from the battery.
  const preconditionJ = parsed.climate ? preconditioningEnergyJ(parsed.climate, context.input.ambientC) : 0;
  if (preconditionJ > 0 && parsed.climate) {
    const fromS = block.pullOutS - parsed.climate.preconditioningS;
    if (depot) {
      const gridJ = preconditionJ / depot.efficiency;
      context.recordGridPower(depot.key, fromS, block.pullOutS, gridJ / parsed.climate.preconditioningS);
      chargingEvents.push({
        chargerKey: depot.key,
        purpose: 'preconditioning',
        startS: fromS,
        endS: block.pullOutS,
        energyWh: 0,
        gridEnergyWh: gridJ / JOULES_PER_WH,
        socBefore: state.soc,
        socAfter: state.soc,
      });
    } else if (isBattery) {
      note(fromS, state.soc);
      const drawnJ = Math.min(preconditionJ, state.soc * capacityJ);
      state.soc -= drawnJ / capacityJ;
      netJ += drawnJ;
    }
  }
  note(timeS, state.soc);

  let previous: PreparedTrip | undefined;
  let stopped = false;
  // A stand (after pull-out, a layover, the wait for pull-in) until `endS`, where the previous trip ended.
  const standUntil = (endS: number) => {
    const stand = stand_(
      context,
      parsed,
      state,
      previous?.model,
      parsed.standAuxPowerW,
      timeS,
      endS,
      previous?.chargerAtEnd,
      isBattery,
      note,
    );
    netJ += stand.netJ;
    chargedJ += stand.chargedJ;
    if (stand.event) chargingEvents.push(stand.event);
    timeS = endS;
  };
  for (let index = 0; index < block.trips.length && !stopped; index++) {
    const trip = block.trips[index]!;
    const label = `trip ${index + 1}`;
    // Stand before the trip: after pull-out, or a layover after the previous trip.
    if (trip.departureS < timeS) {
      problems.push(
        index === 0
          ? `${label} leaves at ${clock(trip.departureS)}, before the pull-out at ${clock(block.pullOutS)}`
          : `${label} leaves at ${clock(trip.departureS)}, before trip ${index} arrives at ${clock(timeS)}`,
      );
    } else if (trip.departureS > timeS) {
      standUntil(trip.departureS);
    }
    const route = context.routeFor(trip);
    if (!route) {
      problems.push(`${label} cannot be driven: route ${trip.routeId} (${trip.direction}) was not given to the calculation`);
      break;
    }
    const prepared = context.prepare(route, parsed, trip.load);
    const routeName = route.name ?? `route ${route.routeId} ${route.direction}`;
    if ('error' in prepared) {
      problems.push(`${label} (${routeName}) cannot be driven: ${prepared.error}`);
      break;
    }
    if (prepared.notDrivable.length > 0) {
      problems.push(`${label} (${routeName}) cannot be driven as drawn at ${prepared.notDrivable.join('; ')}`);
    }
    const startState: VehicleState = { ...state, shortfallJ: 0 };
    const run = prepared.series;
    const tripState: VehicleState = { ...startState };
    const { sourceJ, durationS, regenJ: tripRegenJ, frictionJ: tripFrictionJ } = runTrip(prepared.model, prepared.speedMps, tripState, run);
    const shortfallJ = tripState.shortfallJ;
    const departS = timeS;
    // Trace: trip start, every TRACE_STEP_S inside, and the trip end; the minimum at full resolution.
    let nextTraceS = TRACE_STEP_S;
    for (let i = 0; i < run.soc.length; i++) {
      const soc = run.soc[i]!;
      if (soc < minSoc) {
        minSoc = soc;
        minSocAtS = departS + run.timeS[i]!;
      }
      if (i === 0 || i === run.soc.length - 1 || run.timeS[i]! >= nextTraceS) {
        note(departS + run.timeS[i]!, soc);
        while (nextTraceS <= run.timeS[i]!) nextTraceS += TRACE_STEP_S;
      }
    }
    netJ += sourceJ - shortfallJ;
    regenJ += tripRegenJ;
    frictionJ += tripFrictionJ;
    tripAuxJ += prepared.auxPowerW * durationS;
    tripAuxS += durationS;
    tripAuxMaxW = Math.max(tripAuxMaxW, prepared.auxPowerW);
    timeS = departS + durationS;
    if (isBattery && shortfallJ > 0) {
      let emptyAt = 0;
      for (let i = 0; i < run.soc.length; i++) {
        if (run.soc[i]! <= 0) {
          emptyAt = i;
          break;
        }
      }
      problems.push(
        `${label} (${routeName}) cannot be driven: the battery runs empty at ${km(prepared.model.distanceM[emptyAt]!)} km, ${clock(departS + run.timeS[emptyAt]!)}`,
      );
      stopped = true;
    }
    // Descents with the state the vehicle has when the trip leaves (module comment).
    // Brakes no warmer than the worst-case ambient start that run exactly as the standalone one
    // does, so its peaks are reused; warmer brakes get their own worst-case run.
    const hot = prepared.worstModel.ambientC[0]!;
    const carriesHeat =
      Math.max(startState.brakeTempC, startState.frontBrakeTempC, startState.rearBrakeTempC, startState.gsrsBrakeTempC) > hot;
    let worstRun: TripSeries | undefined;
    if (prepared.ranges.length > 0 && carriesHeat) {
      worstRun = prepared.worstSeries;
      // Only as far as the last descent: nothing after it changes a descent's peak.
      runTrip(
        prepared.worstModel,
        prepared.speedMps,
        startStateForWorstCase(startState, prepared),
        worstRun,
        prepared.ranges.at(-1)!.lastSegment + 1,
      );
    }
    prepared.ranges.forEach((range, r) => {
      const first = range.firstSegment;
      const last = range.lastSegment + 1;
      const dayPeak = Math.max(worstRun ? seriesPeak(worstRun, range) : Number.NEGATIVE_INFINITY, seriesPeak(run, range));
      const standalonePeak = prepared.standalonePeakC[r]!;
      const peak = Math.max(dayPeak, standalonePeak);
      const brakeType = prepared.model.vehicle.brakeType;
      const risk = brakeRiskLevel(peak, brakeType);
      const standaloneRisk = brakeRiskLevel(standalonePeak, brakeType);
      descents.push({
        tripIndex: index,
        routeId: route.routeId,
        direction: route.direction,
        startM: prepared.model.distanceM[first]!,
        endM: prepared.model.distanceM[last]!,
        dropM: prepared.model.elevationM[first]! - prepared.model.elevationM[last]!,
        arrivalSoc: run.soc[first]!,
        arrivalBrakeTempC: run.governingC[first]!,
        peakBrakeTempC: peak,
        risk,
        standaloneRisk,
        worsenedByDay: RISK_RANK[risk] > RISK_RANK[standaloneRisk],
      });
    });
    Object.assign(state, tripState, { shortfallJ: 0 });
    previous = prepared;
  }
  if (!stopped) {
    if (block.pullInS < timeS) {
      problems.push(`the pull-in at ${clock(block.pullInS)} is before the last trip arrives at ${clock(timeS)}`);
    } else if (block.pullInS > timeS) {
      standUntil(block.pullInS);
    }
  }
  note(timeS, state.soc);
  if (isBattery && minSoc < context.input.reserveSoc && !stopped) {
    problems.push(`falls to ${percent(minSoc)} at ${clock(minSocAtS)}, below the ${percent(context.input.reserveSoc)} reserve`);
  }
  return {
    blockId: block.blockId,
    minSoc,
    endSoc: state.soc,
    chargedEnergyWh: chargedJ / JOULES_PER_WH,
    tripNetEnergyWh: netJ / JOULES_PER_WH,
    regenEnergyWh: regenJ / JOULES_PER_WH,
    frictionBrakeEnergyWh: frictionJ / JOULES_PER_WH,
    feasible: problems.length === 0,
    problems,
    socTrace,
    chargingEvents,
    descents,
    vehicle: {
      usableCapacityWh: capacityJ / JOULES_PER_WH,
      maxChargePowerW: parsed.maxChargePowerW,
      auxiliarySource: parsed.climate ? 'climate' : 'season',
      tripAuxPowerW: { mean: tripAuxS > 0 ? tripAuxJ / tripAuxS : 0, max: tripAuxMaxW },
      standingAuxPowerW: parsed.standAuxPowerW,
      standingHeatingPowerW: parsed.standHeatingPowerW,
      preconditioningEnergyWh: preconditionJ / JOULES_PER_WH,
    },
  };
}

/** The worst case starts from the day's brake temperatures, never below the worst-case ambient. */
function startStateForWorstCase(start: VehicleState, prepared: PreparedTrip): VehicleState {
  const hot = prepared.worstModel.ambientC[0]!;
  return {
    ...start,
    soc: prepared.model.vehicle.socCeiling,
    brakeTempC: Math.max(start.brakeTempC, hot),
    frontBrakeTempC: Math.max(start.frontBrakeTempC, hot),
    rearBrakeTempC: Math.max(start.rearBrakeTempC, hot),
    gsrsBrakeTempC: Math.max(start.gsrsBrakeTempC, hot),
    shortfallJ: 0,
    regenOverloadJ: 0,
  };
}

/**
 * The vehicle stands from `fromS` to `toS` (module comment): auxiliaries drawn, brakes cooling,
 * a charger within reach charging after its connect time. Updates `state`; answers the battery's
 * net energy (drawn by the auxiliaries) and the energy charged into it.
 */
function stand_(
  context: DayContext,
  parsed: ParsedVehicle,
  state: VehicleState,
  model: RouteModel | undefined,
  auxPowerW: number,
  fromS: number,
  toS: number,
  charger: Charger | undefined,
  isBattery: boolean,
  note: (timeS: number, soc: number) => void,
): { netJ: number; chargedJ: number; event?: BlockResult['chargingEvents'][number] } {
  const ambientC = context.input.ambientC;
  const vehicle = parsed.vehicle;
  const standModel = model ? withVehicle(model, { ...model.vehicle, auxPowerW }) : undefined;
  const scratch = emptySegmentResult();
  let netJ = 0;
  let chargedJ = 0;
  let gridJ = 0;
  const chargeFromS = charger && isBattery ? fromS + charger.connectS : Number.POSITIVE_INFINITY;
  const target = charger ? Math.min(charger.targetSoc, vehicle.socCeiling) : 0;
  const cold = coldChargeFactor(ambientC, vehicle.coldChargeFullFromC, vehicle.coldChargeShareAtMinus20C);
  let socBefore = state.soc;
  let chargeStartS: number | undefined;
  let chargeEndS = fromS;
  let socAfter = state.soc;
  let t = fromS;
  const aloneW = isBattery ? Math.min(charger ? charger.powerW * charger.efficiency : 0, parsed.maxChargePowerW * cold) : 0;
  while (t < toS - 1e-9) {
    const charging = charger !== undefined && t >= chargeFromS - 1e-9;
    const remainingS = toS - t;
    let dt: number;
    if (!charging) {
      // Standing before the charger connects (or with none): one step to the connection or the end.
      dt = Math.min(remainingS, chargeFromS - t);
    } else if (state.soc >= target - 1e-12) {
      // At the target the charger carries the auxiliaries for the rest of the stand.
      dt = remainingS;
    } else if (state.soc < vehicle.socTaperStart) {
      // Below the taper the charge power is constant: one step until the taper or the target.
      const netW = aloneW - auxPowerW;
      const stopSoc = Math.min(vehicle.socTaperStart, target);
      dt = netW > 0 ? Math.min(remainingS, ((stopSoc - state.soc) * parsed.capacityJ) / netW) : remainingS;
      if (!(dt > 1e-6)) dt = Math.min(STAND_STEP_S, remainingS);
    } else {
      // In the taper the limit follows the SOC: short steps.
      dt = Math.min(STAND_STEP_S, remainingS);
    }
    const socAtStepStart = state.soc;
    // Brakes cool at standstill; the auxiliaries draw from the battery.
    if (standModel) {
      dwell(standModel, standModel.pointCount - 1, dt, state, scratch);
      netJ += scratch.split.sourcePowerW * dt - scratch.split.shortfallJ;
    } else {
      const drawJ = auxPowerW * dt;
      if (isBattery) {
        const next = state.soc - drawJ / parsed.capacityJ;
        netJ += next < 0 ? drawJ + next * parsed.capacityJ : drawJ;
        state.soc = Math.max(0, next);
      } else netJ += drawJ;
    }
    if (charging && charger) {
      const limitW = Math.min(
        charger.powerW * charger.efficiency,
        parsed.maxChargePowerW * chargeTaperFactor(state.soc, vehicle.socTaperStart, vehicle.socCeiling) * cold,
      );
      const wantedW = Math.max(0, ((target - state.soc) * parsed.capacityJ) / dt);
      const intoBatteryW = Math.min(limitW, wantedW);
      if (intoBatteryW > 0) {
        if (chargeStartS === undefined) {
          // Charging and the auxiliaries act together over the step: the charge starts at the step's SOC.
          chargeStartS = t;
          socBefore = socAtStepStart;
          note(t, socAtStepStart);
        }
        chargeEndS = t + dt;
        state.soc += (intoBatteryW * dt) / parsed.capacityJ;
        chargedJ += intoBatteryW * dt;
        socAfter = state.soc;
        gridJ += (intoBatteryW * dt) / charger.efficiency;
        context.recordGridPower(charger.key, t, t + dt, intoBatteryW / charger.efficiency);
      }
    }
    t += dt;
  }
  if (chargeStartS === undefined || !charger) return { netJ, chargedJ };
  note(chargeEndS, socAfter);
  return {
    netJ,
    chargedJ,
    event: {
      chargerKey: charger.key,
      purpose: 'charging',
      startS: chargeStartS,
      endS: chargeEndS,
      energyWh: chargedJ / JOULES_PER_WH,
      gridEnergyWh: gridJ / JOULES_PER_WH,
      socBefore,
      socAfter,
    },
  };
}

function km(metres: number): string {
  return (metres / 1_000).toFixed(1);
}

function percent(share: number): string {
  return `${Math.round(share * 100)} %`;
}

/** Service time as hh:mm (past 24 h for trips after midnight, as GTFS writes them). */
export function clock(seconds: number): string {
  const minutes = Math.floor(seconds / 60);
  return `${String(Math.floor(minutes / 60)).padStart(2, '0')}:${String(minutes % 60).padStart(2, '0')}`;
}
