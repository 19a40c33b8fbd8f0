/**
 * The board summary's headline figures and safety counts, worded once for the web page and the
 * PDF. While the money or CO₂ factor is still the shipped placeholder, the figure resting on it
 * says so beside the value, not only in a footnote.
 */
import type { AnnualBasis, BoardSummary } from '../domain/board-summary';
import { formatBoardCo2, formatBoardEnergy, formatBoardMoney, formatTariff } from './board-format';
import { SEASON_LABELS } from './labels';
import { DAY_TYPE_LABELS } from './service-day-labels';

export interface BoardFigure {
  key: 'recovered' | 'value' | 'co2' | 'friction';
  label: string;
  value: string;
  note: string;
  /** Set while the figure rests on a placeholder factor: the words to print beside the value. */
  placeholder: string | null;
}

export const PLACEHOLDER_FACTOR_NOTE = 'Placeholder factor, not a real figure: an administrator has not yet set the network’s own';

/** The year the headline figures count: the annual basis's own when it has them, else the scenario totals. */
export interface BoardYear {
  basis: 'service-days' | 'scenarios';
  regenKWh: number;
  frictionKWh: number;
  netKWh: number;
  km: number;
  regenValue: number;
  co2AvoidedKg: number;
}

/**
 * One year for every headline figure: on the service-days basis the service days' braking energy,
 * net energy and distance (so the figures add up with "How the year is counted"); the scenario
 * totals while no service day is in service, or while a counted day's stored run predates the
 * braking figures.
 */
export function boardYear(summary: BoardSummary): BoardYear {
  const { totals, settings, annual } = summary;
  if (annual.basis === 'service-days' && annual.regenEnergyKWh !== null && annual.frictionBrakeEnergyKWh !== null) {
    return {
      basis: 'service-days',
      regenKWh: annual.regenEnergyKWh,
      frictionKWh: annual.frictionBrakeEnergyKWh,
      netKWh: annual.netEnergyKWh,
      km: annual.annualKm,
      regenValue: annual.regenEnergyKWh * settings.energyTariffPerKWh,
      co2AvoidedKg: annual.regenEnergyKWh * settings.gridEmissionFactorKgPerKWh,
    };
  }
  return {
    basis: 'scenarios',
    regenKWh: totals.annualRegenKWh,
    frictionKWh: totals.annualFrictionBrakeKWh,
    netKWh: totals.annualNetKWh,
    km: totals.annualKm,
    regenValue: totals.regenValue,
    co2AvoidedKg: totals.co2AvoidedKg,
  };
}

/** Where the headline figures come from, in one sentence. */
export function boardYearSource(summary: BoardSummary): string {
  if (boardYear(summary).basis === 'service-days') return 'counted over the service days in service (see “How the year is counted”)';
  if (summary.annual.basis === 'service-days')
    return 'from the scenarios marked “in service”: a service day in service was run before braking energy was reported, so run it again to count the year over the service days';
  return 'from the scenarios marked “in service”';
}

export function boardFigures(summary: BoardSummary): BoardFigure[] {
  const { settings } = summary;
  const year = boardYear(summary);
  const totals = {
    annualRegenKWh: year.regenKWh,
    annualFrictionBrakeKWh: year.frictionKWh,
    regenValue: year.regenValue,
    co2AvoidedKg: year.co2AvoidedKg,
  };
  const share = shareOfBraking(totals.annualRegenKWh, totals.annualFrictionBrakeKWh);
  const placeholder = (what: string) => (settings.isPlaceholder ? `${PLACEHOLDER_FACTOR_NOTE} ${what}.` : null);
  return [
    {
      key: 'recovered',
      label: 'Braking energy recovered per year',
      value: formatBoardEnergy(totals.annualRegenKWh),
      note: `${share === null ? '' : `${share} % of all braking energy on the network. `}A kilowatt-hour (kWh) is the energy a 1 kW heater uses in one hour.`,
      placeholder: null,
    },
    {
      key: 'value',
      label: 'What that energy is worth',
      value: formatBoardMoney(totals.regenValue, settings.currency),
      note: `Energy the network does not have to buy, at ${formatTariff(settings.energyTariffPerKWh, settings.currency)}.`,
      placeholder: placeholder('tariff'),
    },
    {
      key: 'co2',
      label: 'CO₂ avoided per year',
      value: formatBoardCo2(totals.co2AvoidedKg),
      note: `Emissions of generating that electricity, at ${settings.gridEmissionFactorKgPerKWh.toLocaleString('en-GB', { maximumFractionDigits: 4 })} kg CO₂ per kWh.`,
      placeholder: placeholder('grid emission factor'),
    },
    {
      key: 'friction',
      label: 'Still into the friction brakes',
      value: formatBoardEnergy(totals.annualFrictionBrakeKWh),
      note: 'Lost as heat; this is also what wears brakes and, on long descents, overheats them.',
      placeholder: null,
    },
  ];
}

/** "Open safety items: 2 (1 critical, 1 high)"; "Risk accepted: 1 high". */
export function boardSafetyCounts(summary: BoardSummary): { open: number; accepted: number; acceptedText: string } {
  const { openSafetyItems: open, acceptedRisks: accepted } = summary;
  const acceptedParts = [
    accepted.critical > 0 ? `${accepted.critical} critical` : '',
    accepted.high > 0 ? `${accepted.high} high` : '',
  ].filter(Boolean);
  return {
    open: open.critical + open.high + open.elevated,
    accepted: accepted.critical + accepted.high,
    acceptedText: acceptedParts.length > 0 ? acceptedParts.join(', ') : 'none',
  };
}

/** Share of the braking energy that regeneration recovered, in whole percent; null without braking. */
function shareOfBraking(recoveredKWh: number, frictionKWh: number): number | null {
  const total = recoveredKWh + frictionKWh;
  return total > 0 ? Math.round((recoveredKWh / total) * 100) : null;
}

/**
 * The annual basis in one short paragraph for the printed page: which results make up the year,
 * each service day with its days a year, and the year's grid energy, cost and CO₂ against the
 * reference vehicle. The web page states the same basis at length (`AnnualBasis.basisText`).
 */
export function annualBasisInBrief(annual: AnnualBasis, currency: string): string {
  const totals =
    `${formatBoardEnergy(annual.gridEnergyKWh)} from the grid, ${formatBoardMoney(annual.energyCost, currency)}, ` +
    `${formatBoardCo2(annual.co2Kg)} CO₂: ${formatBoardCo2(annual.baseline.co2SavedKg)} less than the same distance with a ${annual.baseline.name}.`;
  if (annual.basis === 'scenarios') {
    return (
      'No service day is in service, so the year is each route’s latest in-service scenario × its trips a day × its service days a year ' +
      `(grid energy taken as the vehicles’ net energy): ${totals}`
    );
  }
  const days = annual.serviceDays
    .map((day) => `${DAY_TYPE_LABELS[day.dayType].toLowerCase()} ${SEASON_LABELS[day.season].toLowerCase()} × ${day.daysPerYear}`)
    .join(', ');
  const uncovered = annual.notCovered.reduce((total, entry) => total + entry.daysPerYear, 0);
  return (
    `The year is the ${annual.serviceDays.length} in-service service ${annual.serviceDays.length === 1 ? 'day' : 'days'}, each × its days a year ` +
    `from the network settings (${days})${uncovered > 0 ? `; ${uncovered} days without one count as no service` : ''}. ` +
    `Grid energy includes each block’s overnight recharge at its depot: ${totals}`
  );
}
