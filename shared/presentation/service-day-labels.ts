/**
 * Words and times for service days: day types, battery ages, charger kinds and the clock times
 * of a service day (seconds after midnight, past 24 h for trips after midnight, as timetables
 * write them). The screens, the PDF and the CSV read them from here.
 */
import type { BatteryAge, BlockResult, ChargerKind, DayType } from '../domain/service-days';
import { formatQuantity, type UnitSystem } from './units';

export const DAY_TYPE_LABELS: Readonly<Record<DayType, string>> = {
  weekday: 'Weekday',
  saturday: 'Saturday',
  'sunday-holiday': 'Sunday or holiday',
};

export const BATTERY_AGE_LABELS: Readonly<Record<BatteryAge, string>> = {
  'beginning-of-life': 'New battery',
  'end-of-life': 'End of battery life',
};

export const CHARGER_KIND_LABELS: Readonly<Record<ChargerKind, string>> = {
  depot: 'Depot charger',
  terminus: 'Terminus charger',
};

/** "06:05", "24:40" (a time after midnight stays on the same service day, as in timetables). */
export function formatServiceTime(timeS: number): string {
  const minutes = Math.floor(Math.max(0, timeS) / 60);
  return `${String(Math.floor(minutes / 60)).padStart(2, '0')}:${String(minutes % 60).padStart(2, '0')}`;
}

/**
 * Reads "6:05", "06:05" or "25:10" (hours up to 36, minutes 00–59) as seconds after midnight;
 * null when the text is not such a time.
 */
export function parseServiceTime(text: string): number | null {
  const match = /^\s*(\d{1,2}):([0-5]\d)\s*$/.exec(text);
  if (!match) return null;
  const hours = Number(match[1]);
  const minutes = Number(match[2]);
  const seconds = hours * 3600 + minutes * 60;
  return seconds > 36 * 3600 ? null : seconds;
}

/** "1 h 25 min", "40 min": a span of the day in words. */
export function formatDuration(durationS: number): string {
  const minutes = Math.round(Math.max(0, durationS) / 60);
  if (minutes < 60) return `${minutes} min`;
  const rest = minutes % 60;
  return rest === 0 ? `${Math.floor(minutes / 60)} h` : `${Math.floor(minutes / 60)} h ${rest} min`;
}

/** Blocks that cannot be worked first (lowest SOC first among them), then the rest by name. */
export function orderBlocks<T extends Pick<BlockResult, 'blockId' | 'feasible' | 'minSoc'>>(blocks: readonly T[]): T[] {
  return [...blocks].sort((a, b) => {
    if (a.feasible !== b.feasible) return a.feasible ? 1 : -1;
    if (!a.feasible) return a.minSoc - b.minSoc;
    return a.blockId.localeCompare(b.blockId, 'en', { numeric: true });
  });
}

/** What a service-day run leaves out, said beside its results on screen and in the report. */
export const SERVICE_DAY_NOT_COVERED =
  'Not covered: traffic and delays that shorten layovers, queues at chargers beyond the timetable, driver behaviour and faults. ' +
  'The run follows the blocks as timetabled; the vehicle maker’s limits, local codes and a licensed engineer decide on service.';

/** Line colours for the blocks on the SOC chart, repeated past twelve blocks; our own palette. */
export const BLOCK_COLOURS: readonly string[] = [
  '#0b5567',
  '#a0522d',
  '#3f7f4f',
  '#6a4c93',
  '#b8860b',
  '#1f6fb2',
  '#8b3a62',
  '#4f6d2f',
  '#c05a00',
  '#2e5e8c',
  '#7a5c3e',
  '#00796b',
];

/** Colour of the reserve line. */
export const RESERVE_COLOUR = '#b3261e';

/**
 * What a stop at a charger was for, in words: a depot charger heating or cooling the cabin before
 * pull-out puts no energy into the battery, so it must not read as a charge.
 */
export const CHARGING_PURPOSE_LABELS: Readonly<Record<'charging' | 'preconditioning', string>> = {
  charging: 'Charging',
  preconditioning: 'Cabin pre-conditioning',
};

export function chargingPurposeLabel(purpose: 'charging' | 'preconditioning' | undefined): string {
  return CHARGING_PURPOSE_LABELS[purpose ?? 'charging'];
}

/**
 * Why a block's energy came out as it did, in one sentence: the battery it had at the day's age
 * and what the auxiliaries drew (from the cabin climate or the season's constant). The result page
 * and the PDF both print it under a block that cannot be worked. Empty for results stored before
 * blocks reported their vehicle.
 */
export function blockVehicleSentence(block: BlockResult, batteryAge: BatteryAge, system: UnitSystem): string {
  const vehicle = block.vehicle;
  if (!vehicle) return '';
  const battery =
    `${batteryAge === 'end-of-life' ? 'At the end of its life the battery holds' : 'The new battery holds'} ` +
    `${formatQuantity('energy', vehicle.usableCapacityWh, system, 0)} usable and charges at up to ${formatQuantity('power', vehicle.maxChargePowerW, system)}.`;
  const drawn = `Auxiliaries drew ${formatQuantity('power', vehicle.tripAuxPowerW.mean, system, 1)} on the trips`;
  if (vehicle.auxiliarySource === 'season') return `${battery} ${drawn} (the season's constant auxiliary power).`;
  return (
    `${battery} ${drawn} (cabin climate: heating ${formatQuantity('power', vehicle.standingHeatingPowerW, system, 1)} at a stop, ` +
    `pre-conditioning ${formatQuantity('energy', vehicle.preconditioningEnergyWh, system)}).`
  );
}
