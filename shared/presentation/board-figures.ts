/**
 * The board summary's headline figures and safety counts, worded once for the web page and the
 * PDF. While the money or CO₂ factor is still the shipped placeholder, the figure resting on it
 * says so beside the value, not only in a footnote.
 */
import type { BoardSummary } from '../domain/board-summary';
import { formatBoardCo2, formatBoardEnergy, formatBoardMoney, formatTariff } from './board-format';

export interface BoardFigure {
  key: 'recovered' | 'value' | 'co2' | 'friction';
  label: string;
  value: string;
  note: string;
  /** Set while the figure rests on a placeholder factor: the words to print beside the value. */
  placeholder: string | null;
}

export const PLACEHOLDER_FACTOR_NOTE = 'Placeholder factor, not a real figure: an administrator has not yet set the network’s own';

export function boardFigures(summary: BoardSummary): BoardFigure[] {
  const { totals, settings } = summary;
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
