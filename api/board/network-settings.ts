import { eq } from 'drizzle-orm';
import type { User } from '@shared/domain/auth';
import {
  DEFAULT_CO2_REFERENCE_VEHICLE,
  DEFAULT_DAY_COUNTS,
  totalDays,
  type NetworkSettings,
  type NetworkSettingsUpdate,
  type NetworkSettingsView,
} from '@shared/domain/board-summary';
import type { Executor } from '../db/client';
import {
  DEFAULT_CRAWL_DISTANCE_M,
  DEFAULT_CRAWL_SPEED_KPH,
  DEFAULT_FADE_MARGIN_K,
  DEFAULT_MAX_ROAD_GRADE_PERCENT,
  DEFAULT_WORST_CASE_AMBIENT_C,
} from '@shared/engine/constants';
import { networkSettings } from '../db/schema/index';
import { UnprocessableError } from '../http/http-error';

/**
 * What a fresh installation shows until an admin sets real figures; the same values as the
 * migration guard_review_events_and_seed_settings inserts. Illustrative placeholders, not facts.
 */
export const PLACEHOLDER_NETWORK_SETTINGS: NetworkSettings = {
  energyTariffPerKWh: 0.2,
  currency: 'EUR',
  tariffSource:
    'Illustrative placeholder, not a real tariff: replace with the price per kWh of your electricity contract and name it here.',
  gridEmissionFactorKgPerKWh: 0.3,
  emissionFactorSource:
    'Illustrative placeholder, from memory and not checked: grid averages in Europe are of the order of 0.2–0.4 kg CO2 per kWh. ' +
    'Replace with your supplier’s or the national figure for the year and name its source here.',
  worstCaseAmbientC: DEFAULT_WORST_CASE_AMBIENT_C,
  fadeMarginK: DEFAULT_FADE_MARGIN_K,
  maxRoadGradePercent: DEFAULT_MAX_ROAD_GRADE_PERCENT,
  crawlSpeedKph: DEFAULT_CRAWL_SPEED_KPH,
  crawlDistanceM: DEFAULT_CRAWL_DISTANCE_M,
  dayCounts: DEFAULT_DAY_COUNTS,
  co2ReferenceVehicle: DEFAULT_CO2_REFERENCE_VEHICLE,
};

export async function readNetworkSettings(db: Executor): Promise<NetworkSettingsView> {
  const [row] = await db.select().from(networkSettings).where(eq(networkSettings.key, 'network'));
  if (!row) return { ...PLACEHOLDER_NETWORK_SETTINGS, isPlaceholder: true, updatedAt: null, updatedByName: null };
  return {
    energyTariffPerKWh: row.energyTariffPerKWh,
    currency: row.currency,
    tariffSource: row.tariffSource,
    gridEmissionFactorKgPerKWh: row.gridEmissionFactorKgPerKWh,
    emissionFactorSource: row.emissionFactorSource,
    worstCaseAmbientC: row.worstCaseAmbientC,
    fadeMarginK: row.fadeMarginK,
    maxRoadGradePercent: row.maxRoadGradePercent,
    crawlSpeedKph: row.crawlSpeedKph,
    crawlDistanceM: row.crawlDistanceM,
    dayCounts: row.dayCounts,
    co2ReferenceVehicle: row.co2ReferenceVehicle,
    isPlaceholder: row.updatedAt === null,
    updatedAt: row.updatedAt?.toISOString() ?? null,
    updatedByName: row.updatedByName ?? null,
  };
}

/** Saves the factors; a safety setting the request leaves out keeps its stored value. */
export async function saveNetworkSettings(db: Executor, admin: User, update: NetworkSettingsUpdate): Promise<NetworkSettingsView> {
  if (update.dayCounts) {
    const total = totalDays(update.dayCounts);
    if (total !== 365 && total !== 366) {
      throw new UnprocessableError(
        `dayCounts: the days of each day type and season add up to ${total}; they must add up to 365 (or 366 in a leap year)`,
        'day_counts_not_a_year',
        { field: 'dayCounts', total },
      );
    }
  }
  const current = await readNetworkSettings(db);
  const stored = await readSafetySettings(db);
  const settings: NetworkSettings = {
    ...update,
    worstCaseAmbientC: update.worstCaseAmbientC ?? stored.worstCaseAmbientC,
    fadeMarginK: update.fadeMarginK ?? stored.fadeMarginK,
    maxRoadGradePercent: update.maxRoadGradePercent ?? stored.maxRoadGradePercent,
    crawlSpeedKph: update.crawlSpeedKph ?? stored.crawlSpeedKph,
    crawlDistanceM: update.crawlDistanceM ?? stored.crawlDistanceM,
    dayCounts: update.dayCounts ?? current.dayCounts,
    co2ReferenceVehicle: update.co2ReferenceVehicle ?? current.co2ReferenceVehicle,
  };
  const values = { ...settings, updatedById: admin.id, updatedByName: admin.name, updatedAt: new Date() };
  await db
    .insert(networkSettings)
    .values({ key: 'network', ...values })
    .onConflictDoUpdate({ target: networkSettings.key, set: values });
  return readNetworkSettings(db);
}

/** The safety settings every scenario and network run analyses with (engine `options.safety`). */
export async function readSafetySettings(db: Executor): Promise<NetworkSafetySettings> {
  const settings = await readNetworkSettings(db);
  return {
    worstCaseAmbientC: settings.worstCaseAmbientC,
    fadeMarginK: settings.fadeMarginK,
    maxRoadGradePercent: settings.maxRoadGradePercent,
    crawlSpeedKph: settings.crawlSpeedKph,
    crawlDistanceM: settings.crawlDistanceM,
  };
}

export type NetworkSafetySettings = Pick<
  NetworkSettings,
  'worstCaseAmbientC' | 'fadeMarginK' | 'maxRoadGradePercent' | 'crawlSpeedKph' | 'crawlDistanceM'
>;

/** The safety settings in words, for the reasons a stored result is out of date. */
const SAFETY_SETTING_WORDS: Readonly<Record<keyof NetworkSafetySettings, string>> = {
  worstCaseAmbientC: 'worst-case ambient temperature',
  fadeMarginK: 'fade margin',
  maxRoadGradePercent: 'steepest road grade',
  crawlSpeedKph: 'crawl speed',
  crawlDistanceM: 'crawl distance',
};

/**
 * Why a result computed with the safety settings `used` is out of date now, in plain words
 * ("the network settings' fade margin changed after the run"), or undefined when none of them
 * changed. A result stored before runs recorded their settings (`used` absent) is not marked.
 */
export function safetySettingsChangedReason(
  used: Partial<Record<keyof NetworkSafetySettings, number>> | undefined,
  now: NetworkSafetySettings,
): string | undefined {
  if (!used) return undefined;
  const changed = (Object.keys(SAFETY_SETTING_WORDS) as (keyof NetworkSafetySettings)[]).filter(
    (key) => used[key] !== undefined && used[key] !== now[key],
  );
  if (changed.length === 0) return undefined;
  return `the network settings' ${changed.map((key) => SAFETY_SETTING_WORDS[key]).join(', ')} changed after the run`;
}

/** Puts the placeholders in place when no row exists (demo seed); never overwrites an admin's figures. */
export async function ensureNetworkSettings(db: Executor): Promise<void> {
  await db
    .insert(networkSettings)
    .values({ key: 'network', ...PLACEHOLDER_NETWORK_SETTINGS })
    .onConflictDoNothing();
}
