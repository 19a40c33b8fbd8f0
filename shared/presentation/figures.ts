/**
 * Every figure Descentry reports about a scenario, with one label, one unit and one rounding,
 * whatever shows it: the result and compare screens, the scenario report PDF, the e-mails and the
 * CSV headers read their names from here, so "Traction energy" on screen is "Traction energy" in
 * the PDF, with the same value.
 */
import type { Descent, Summary } from '../domain/analysis';
import {
  formatSafeSpeed,
  formatSocLimit,
  formatTemperatureLimit,
  formatTemperatureReached,
  temperatureReachedShown,
} from './safety-rounding';
import { defaultDigits, formatNumber, formatQuantity, toDisplay, unitLabel, type Quantity, type UnitSystem } from './units';

/** How a figure is rounded for display. */
export type Rounding =
  /** to the quantity's usual decimals */
  | 'nearest'
  /** a temperature the brakes reach: up to the whole degree */
  | 'temperature-reached';

export interface SummaryFigure {
  key: keyof Summary | 'frictionAndRetarder';
  /** The name every output prints. */
  label: string;
  /** One sentence: what the figure counts. */
  meaning: string;
  quantity: Quantity;
  rounding: Rounding;
  /** Whether a larger value is better (regeneration) or worse (friction brakes, heat); for colour and differences. */
  better?: 'higher' | 'lower';
  value: (summary: Summary) => number;
}

const figure = (
  key: keyof Summary,
  label: string,
  meaning: string,
  quantity: Quantity,
  extra: Partial<SummaryFigure> = {},
): SummaryFigure => ({
  key,
  label,
  meaning,
  quantity,
  rounding: 'nearest',
  value: (summary) => summary[key] as number,
  ...extra,
});

/** The energy figures, in the order every output lists them. */
export const ENERGY_FIGURES: readonly SummaryFigure[] = [
  figure('tractionEnergyWh', 'Traction energy', 'Energy the wheels deliver while driving.', 'energy'),
  figure('regenEnergyWh', 'Regenerated', 'Braking energy put back into the battery or the line.', 'energy', { better: 'higher' }),
  figure('frictionBrakeEnergyWh', 'Friction brakes', 'Braking energy the friction brakes turn into heat.', 'energy', { better: 'lower' }),
  figure('retarderEnergyWh', 'Retarder / braking resistor', 'Braking energy the retarder or braking resistor takes.', 'energy'),
  figure('auxEnergyWh', 'Auxiliaries', 'Heating, cooling, lighting and compressors, all the way.', 'energy'),
  figure('batteryNetEnergyWh', 'Net from battery or line', 'Energy drawn from the battery or line minus energy put back.', 'energy', {
    better: 'lower',
  }),
  figure('kWhPerKm', 'Net per distance', 'Net energy from the battery or line per distance driven.', 'energyPerDistance', {
    better: 'lower',
  }),
];

/** Route, time, charge and brake figures, after the energy. */
export const ROUTE_FIGURES: readonly SummaryFigure[] = [
  figure('lengthM', 'Length', 'Distance along the route.', 'distance'),
  figure('ascentM', 'Ascent', 'Height climbed.', 'elevation'),
  figure('descentM', 'Descent', 'Height lost.', 'elevation'),
  figure('durationS', 'Running time', 'Time driving and at stops.', 'duration'),
  figure('endSoc', 'SOC at the end', 'State of charge of the battery at the end.', 'soc'),
  figure('peakBrakeTempC', 'Peak brake temperature', 'Hottest the friction brakes get (rounded up).', 'temperature', {
    rounding: 'temperature-reached',
    better: 'lower',
  }),
];

export const SUMMARY_FIGURES: readonly SummaryFigure[] = [...ENERGY_FIGURES, ...ROUTE_FIGURES];

/** A summary figure as shown: the rounded number in display units, its decimals and unit. */
export function shownFigure(figure: SummaryFigure, summary: Summary, system: UnitSystem): { value: number; digits: number; unit: string } {
  const unit = unitLabel(figure.quantity, system);
  if (figure.rounding === 'temperature-reached') {
    return { value: temperatureReachedShown(figure.value(summary), system), digits: 0, unit };
  }
  const digits = defaultDigits(figure.quantity, system);
  const scale = 10 ** digits;
  return { value: Math.round(toDisplay(figure.quantity, figure.value(summary), system) * scale) / scale, digits, unit };
}

/** A summary figure's value as shown, with its unit: "38.8 kWh". */
export function formatFigure(figure: SummaryFigure, summary: Summary, system: UnitSystem): string {
  const shown = shownFigure(figure, summary, system);
  return Number.isFinite(shown.value) ? `${formatNumber(shown.value, shown.digits)} ${shown.unit}` : '—';
}

/**
 * "+1.2 kWh", "−3 °C", "±0": the change of a figure from a reference, taken between the values
 * as shown, so a table never shows "97 % (−0 %)" beside two equal figures.
 */
export function formatFigureDifference(figure: SummaryFigure, summary: Summary, reference: Summary, system: UnitSystem): string {
  const shown = shownFigure(figure, summary, system);
  const base = shownFigure(figure, reference, system);
  const delta = Math.round((shown.value - base.value) * 10 ** shown.digits) / 10 ** shown.digits;
  if (!Number.isFinite(delta)) return '';
  if (delta === 0) return '±0';
  return `${delta > 0 ? '+' : '−'}${formatNumber(Math.abs(delta), shown.digits)} ${shown.unit}`;
}

/** Whether a change is for the better, the worse, or neither (for colour). */
export function differenceTone(figure: SummaryFigure, summary: Summary, reference: Summary): 'better' | 'worse' | 'neutral' {
  const delta = figure.value(summary) - figure.value(reference);
  if (!figure.better || Math.abs(delta) < 1e-9) return 'neutral';
  return delta > 0 === (figure.better === 'higher') ? 'better' : 'worse';
}

/** The descent's place and shape in words: "km 12.3–15.8, drop 240 m, mean 7.1 %, steepest 9.4 %". */
export function describeDescentPlace(
  descent: Pick<Descent, 'startM' | 'endM' | 'dropM' | 'meanGradePercent' | 'maxGradePercent'>,
  system: UnitSystem,
): string {
  return (
    `${formatStretch(descent.startM, descent.endM, system)}, drop ${formatQuantity('elevation', descent.dropM, system)}, ` +
    `mean grade ${formatQuantity('grade', Math.abs(descent.meanGradePercent), system)} down, ` +
    `steepest ${formatQuantity('grade', Math.abs(descent.maxGradePercent), system)}`
  );
}

/** "km 12.3–15.8" / "mi 7.6–9.8": a stretch along the route, from its start. */
export function formatStretch(fromM: number, toM: number, system: UnitSystem): string {
  const unit = system === 'metric' ? 'km' : 'mi';
  const number = (m: number) => formatQuantity('distance', m, system, 1).replace(/ \w+$/, '');
  return `${unit} ${number(fromM)}–${number(toM)}`;
}

export { formatSafeSpeed, formatSocLimit, formatTemperatureLimit, formatTemperatureReached };
