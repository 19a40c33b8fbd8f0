/**
 * The network's year on one basis (shared/domain/board-summary.ts `annualBasisSchema`).
 *
 * Service-days basis, used as soon as one service day is in service and has a stored run:
 *   year = Σ over in-service service days of (the day's figures × the days of its day type and
 *   season in the year), the day counts from the network settings. Every block runs both
 *   directions as its trips say. Per day:
 *   - net energy = Σ blocks' net battery energy of trips and layovers;
 *   - grid energy = Σ charging events' grid energy + the overnight recharge back to the block's
 *     start SOC, (net energy − energy charged during the day) ÷ the depot charger's efficiency
 *     (a block without a depot charger: the mean efficiency of the day's chargers, 1 without any);
 *   - km = Σ trips' route lengths;
 *   - braking energy regenerated and taken by the friction brakes = Σ blocks' trips (null while a
 *     counted day's stored run predates these figures; the board then says so).
 * The board's headline figures (recovered, its worth, CO₂ avoided, friction) are this year's when
 * the basis is service days, so every annual figure on the page rests on the same days.
 * Scenario basis otherwise: the scenario totals the board already shows (route trips per day ×
 * service days per year); grid energy = net energy (charger losses unknown there).
 *
 * Sensitivity from the stored results, no re-runs: tariff and emission factor ±10 % act linearly;
 * ±10 % winter days moves days between winter and mild of each day type (the year stays 365);
 * ±10 % on the reference vehicle's consumption moves the baseline. Auxiliary load, battery age and
 * passenger load need re-runs of every day and are not in the table (the method text says so).
 */
import type { AnnualBasis, BoardSummary, NetworkSettingsView } from '@shared/domain/board-summary';
import { DAY_TYPES, type DayType } from '@shared/domain/service-days';
import { SEASONS, type Season } from '@shared/domain/vehicle-profiles';
import type { Executor } from '../db/client';
import * as routes from '../road-routes/road-routes-repository';
import * as repository from '../service-days/service-days-repository';

interface DayFigures {
  id: string;
  name: string;
  dayType: DayType;
  season: Season;
  computedAt: Date;
  isStale: boolean;
  infeasibleBlocks: number;
  netWh: number;
  gridWh: number;
  /** Null when the stored run predates the braking figures (rerunning the day fills them). */
  regenWh: number | null;
  frictionWh: number | null;
  km: number;
  chargers: { key: string; name: string; kind: 'depot' | 'terminus'; daytimePeakW: number; overnightPeakW: number | null }[];
}

const SENSITIVITY_METHOD =
  'From the stored results, without re-running: ±10 % on the tariff and on the grid emission factor act in proportion; ' +
  '±10 % winter days moves that many days of each day type between winter and mild (the year keeps its length); ' +
  '±10 % on the reference vehicle’s consumption moves the baseline. Auxiliary load, battery age and passenger load change the runs themselves ' +
  'and need the service days re-run with those settings; they are not in this table.';

export async function annualBasis(
  db: Executor,
  settings: NetworkSettingsView,
  scenarioTotals: BoardSummary['totals'],
): Promise<AnnualBasis> {
  const days = await inServiceDayFigures(db);
  const reference = settings.co2ReferenceVehicle;
  const perKmCo2 = reference.consumptionPerKm * reference.emissionFactorKgPerUnit;
  const tariff = settings.energyTariffPerKWh;
  const factor = settings.gridEmissionFactorKgPerKWh;

  if (days.length === 0) {
    const gridKWh = scenarioTotals.annualNetKWh;
    const baselineCo2 = scenarioTotals.annualKm * perKmCo2;
    const co2 = gridKWh * factor;
    return {
      basis: 'scenarios',
      basisText:
        'No service day is in service yet, so the year comes from the in-service scenarios: each route’s latest in-service result × its trips per day × ' +
        'its service days per year. Grid energy is taken as the vehicles’ net energy (charger losses are not known on this basis). ' +
        'Mark service days in service to count whole vehicle days, charging and the seasons instead.',
      netEnergyKWh: scenarioTotals.annualNetKWh,
      regenEnergyKWh: scenarioTotals.annualRegenKWh,
      frictionBrakeEnergyKWh: scenarioTotals.annualFrictionBrakeKWh,
      gridEnergyKWh: gridKWh,
      energyCost: gridKWh * tariff,
      co2Kg: co2,
      annualKm: scenarioTotals.annualKm,
      baseline: { ...reference, co2Kg: baselineCo2, co2SavedKg: baselineCo2 - co2 },
      serviceDays: [],
      notCovered: [],
      peakCharging: [],
      sensitivity: sensitivityRows({ gridKWh, tariff, factor, baselineCo2, winterShift: null }),
      sensitivityMethod: SENSITIVITY_METHOD,
    };
  }

  const counts = settings.dayCounts;
  let netWh = 0;
  let gridWh = 0;
  let regenWh: number | null = 0;
  let frictionWh: number | null = 0;
  let km = 0;
  for (const day of days) {
    const weight = counts[day.dayType][day.season];
    netWh += day.netWh * weight;
    gridWh += day.gridWh * weight;
    regenWh = regenWh === null || day.regenWh === null ? null : regenWh + day.regenWh * weight;
    frictionWh = frictionWh === null || day.frictionWh === null ? null : frictionWh + day.frictionWh * weight;
    km += day.km * weight;
  }
  const notCovered: AnnualBasis['notCovered'] = [];
  for (const dayType of DAY_TYPES) {
    for (const season of SEASONS) {
      const daysPerYear = counts[dayType][season];
      if (daysPerYear > 0 && !days.some((day) => day.dayType === dayType && day.season === season))
        notCovered.push({ dayType, season, daysPerYear });
    }
  }
  // Moving 10 % of each day type's winter days to mild (and back): Δ = days moved × (winter day − mild day).
  let winterShiftGridWh = 0;
  let winterShiftKm = 0;
  let winterShiftCovered = true;
  for (const dayType of DAY_TYPES) {
    const winter = days.filter((day) => day.dayType === dayType && day.season === 'winter');
    const mild = days.filter((day) => day.dayType === dayType && day.season === 'mild');
    if (counts[dayType].winter === 0) continue;
    if (winter.length === 0 || mild.length === 0) winterShiftCovered = false;
    const moved = 0.1 * counts[dayType].winter;
    winterShiftGridWh += moved * (sum(winter, (day) => day.gridWh) - sum(mild, (day) => day.gridWh));
    winterShiftKm += moved * (sum(winter, (day) => day.km) - sum(mild, (day) => day.km));
  }
  const gridKWh = gridWh / 1_000;
  const co2 = gridKWh * factor;
  const baselineCo2 = km * perKmCo2;
  const peaks = new Map<string, AnnualBasis['peakCharging'][number]>();
  for (const day of days) {
    for (const charger of day.chargers) {
      const kept = peaks.get(charger.key);
      peaks.set(charger.key, {
        chargerKey: charger.key,
        chargerName: charger.name,
        kind: charger.kind,
        daytimePeakW: Math.max(kept?.daytimePeakW ?? 0, charger.daytimePeakW),
        overnightPeakW: charger.overnightPeakW === null && !kept ? null : Math.max(kept?.overnightPeakW ?? 0, charger.overnightPeakW ?? 0),
      });
    }
  }
  const dayTypesCounted = [...new Set(days.map((day) => `${day.dayType} ${day.season}`))].length;
  return {
    basis: 'service-days',
    basisText:
      `The year is the sum over the ${days.length} in-service service day(s) (${dayTypesCounted} of the 9 day-type and season combinations) of each day’s ` +
      'last run × the days of its day type and season in the year, as the network settings count them; every block counts both directions as its trips run. ' +
      'Grid energy adds each block’s overnight recharge back to its pull-out SOC at its depot charger’s efficiency to what the chargers delivered during the day.' +
      (notCovered.length > 0
        ? ` Day types and seasons without an in-service day count as zero (${notCovered.reduce((total, entry) => total + entry.daysPerYear, 0)} days of the year).`
        : ''),
    netEnergyKWh: netWh / 1_000,
    regenEnergyKWh: regenWh === null ? null : regenWh / 1_000,
    frictionBrakeEnergyKWh: frictionWh === null ? null : frictionWh / 1_000,
    gridEnergyKWh: gridKWh,
    energyCost: gridKWh * tariff,
    co2Kg: co2,
    annualKm: km,
    baseline: { ...reference, co2Kg: baselineCo2, co2SavedKg: baselineCo2 - co2 },
    serviceDays: days.map((day) => ({
      id: day.id,
      name: day.name,
      dayType: day.dayType,
      season: day.season,
      daysPerYear: counts[day.dayType][day.season],
      computedAt: day.computedAt.toISOString(),
      isStale: day.isStale,
      infeasibleBlocks: day.infeasibleBlocks,
      dayNetEnergyKWh: day.netWh / 1_000,
      dayGridEnergyKWh: day.gridWh / 1_000,
      dayKm: day.km,
    })),
    notCovered,
    peakCharging: [...peaks.values()].sort((a, b) => b.daytimePeakW + (b.overnightPeakW ?? 0) - (a.daytimePeakW + (a.overnightPeakW ?? 0))),
    sensitivity: sensitivityRows({
      gridKWh,
      tariff,
      factor,
      baselineCo2,
      winterShift: winterShiftCovered ? { gridKWh: winterShiftGridWh / 1_000, km: winterShiftKm, perKmCo2 } : null,
    }),
    sensitivityMethod:
      SENSITIVITY_METHOD +
      (winterShiftCovered ? '' : ' The winter-days row is left out: it needs an in-service winter and mild day of each day type.'),
  };
}

function sensitivityRows(input: {
  gridKWh: number;
  tariff: number;
  factor: number;
  baselineCo2: number;
  winterShift: { gridKWh: number; km: number; perKmCo2: number } | null;
}): AnnualBasis['sensitivity'] {
  const { gridKWh, tariff, factor, baselineCo2, winterShift } = input;
  const rows: AnnualBasis['sensitivity'] = [
    { factor: 'Energy tariff', change: '+10 %', energyCostDelta: 0.1 * gridKWh * tariff, co2SavedDeltaKg: 0 },
    { factor: 'Grid emission factor', change: '+10 %', energyCostDelta: 0, co2SavedDeltaKg: -0.1 * gridKWh * factor },
    { factor: 'Reference vehicle consumption', change: '+10 %', energyCostDelta: 0, co2SavedDeltaKg: 0.1 * baselineCo2 },
  ];
  if (winterShift) {
    rows.push({
      factor: 'Winter days (moved from mild days)',
      change: '+10 %',
      energyCostDelta: winterShift.gridKWh * tariff,
      co2SavedDeltaKg: winterShift.km * winterShift.perKmCo2 - winterShift.gridKWh * factor,
    });
  }
  const size = (row: AnnualBasis['sensitivity'][number]) =>
    Math.abs(row.energyCostDelta * (factor / Math.max(tariff, 1e-9))) + Math.abs(row.co2SavedDeltaKg);
  return rows.sort((a, b) => size(b) - size(a));
}

function sum<T>(items: T[], pick: (item: T) => number): number {
  return items.reduce((total, item) => total + pick(item), 0);
}

async function inServiceDayFigures(db: Executor): Promise<DayFigures[]> {
  const rows = await repository.listServiceDayRows(db, { inService: true });
  const results = await repository.findResultRows(
    db,
    rows.map((row) => row.id),
  );
  const context = await repository.stalenessContext(db, rows);
  const lengthCache = new Map<string, number>();
  const figures: DayFigures[] = [];
  for (const row of rows) {
    const result = results.find((candidate) => candidate.serviceDayId === row.id);
    if (!result?.result || !result.computedAt) continue;
    const { blocks, chargers } = repository.parseDocument(row);
    const meanEfficiency = chargers.length > 0 ? sum(chargers, (charger) => charger.efficiency) / chargers.length : 1;
    let netWh = 0;
    let gridWh = 0;
    let regenWh: number | null = 0;
    let frictionWh: number | null = 0;
    let km = 0;
    for (const blockResult of result.result.blocks) {
      regenWh = regenWh === null || blockResult.regenEnergyWh === undefined ? null : regenWh + blockResult.regenEnergyWh;
      frictionWh =
        frictionWh === null || blockResult.frictionBrakeEnergyWh === undefined ? null : frictionWh + blockResult.frictionBrakeEnergyWh;
      const block = blocks.find((candidate) => candidate.blockId === blockResult.blockId);
      const depot = chargers.find((charger) => charger.key === block?.depotChargerKey);
      netWh += blockResult.tripNetEnergyWh;
      gridWh += sum(blockResult.chargingEvents, (event) => event.gridEnergyWh);
      gridWh += Math.max(0, blockResult.tripNetEnergyWh - blockResult.chargedEnergyWh) / (depot?.efficiency ?? meanEfficiency);
    }
    for (const block of blocks) {
      for (const trip of block.trips) {
        const route = trip.routeVersion === undefined ? await routes.findRoute(db, trip.routeId) : undefined;
        const version = trip.routeVersion ?? route?.currentVersion;
        if (version === undefined) continue;
        const key = `${trip.routeId}|${version}`;
        if (!lengthCache.has(key)) lengthCache.set(key, (await routes.findVersion(db, trip.routeId, version))?.lengthM ?? 0);
        km += lengthCache.get(key)! / 1_000;
      }
    }
    figures.push({
      id: row.id,
      name: row.name,
      dayType: row.dayType,
      season: row.season,
      computedAt: result.computedAt,
      isStale: repository.staleReasons(row, result, context).length > 0,
      infeasibleBlocks: result.result.blocks.filter((block) => !block.feasible).length,
      netWh,
      gridWh,
      regenWh,
      frictionWh,
      km,
      chargers: chargers.map((charger) => ({
        key: charger.key,
        name: charger.name,
        kind: charger.kind,
        daytimePeakW: result.result!.peakChargingPowerW.find((peak) => peak.chargerKey === charger.key)?.powerW ?? 0,
        overnightPeakW:
          charger.kind === 'depot' ? charger.powerW * blocks.filter((block) => block.depotChargerKey === charger.key).length : null,
      })),
    });
  }
  return figures;
}
