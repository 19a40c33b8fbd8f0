/**
 * How calibration figures read on screen: each fitted parameter in the unit analysts use for it,
 * and the chart lines of a replay comparison (measured solid, modelled dashed, same colour
 * family as the scenario screens). Pure, so the screens and their checks share it.
 */
import type { ReplayComparison } from '@shared/domain/logged-trips';
import { FIT_PARAMETER_LABELS, type FitParameter } from '@shared/engine/calibration-parameters';
import type { ChartSeries } from '../charts/distance-chart';
import { formatQuantity, toDisplay, type UnitSystem } from '../units/unit-format';

export { FIT_PARAMETER_LABELS };

/** A parameter value as read: "0.0085", "5.21 m²", "9.2 kW", "84.5 %", "2.2 t", "84 kJ/K". */
export function formatParameter(key: FitParameter, value: number | null | undefined, system: UnitSystem): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  switch (key) {
    case 'rollingResistanceCoefficient':
      return value.toFixed(4);
    case 'dragAreaM2':
    case 'brakeCoolingAreaM2':
      return formatQuantity('area', value, system, 2);
    case 'auxPowerW':
      return formatQuantity('power', value, system, 1);
    case 'drivetrainEfficiency':
    case 'regenEfficiency':
      return `${(value * 100).toFixed(1)} %`;
    case 'payloadKg':
      return formatQuantity('mass', value, system, 2);
    case 'brakeThermalMassJPerK':
      return formatQuantity('heatCapacity', value, system);
  }
}

/** Change from the profile's value in per cent ("+12.3 %"), or "—". */
export function formatChange(initial: number, fitted: number): string {
  if (!(Math.abs(initial) > 0)) return '—';
  const percent = (100 * (fitted - initial)) / Math.abs(initial);
  return `${percent >= 0 ? '+' : '−'}${Math.abs(percent).toFixed(1)} %`;
}

/** "−34.3 %", "+1.1 %": a signed percentage with a true minus sign, or "—". */
export function signedPercent(value: number | null | undefined, digits = 1): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  const text = Math.abs(value).toFixed(digits);
  return `${value < 0 && Number(text) !== 0 ? '−' : value > 0 && Number(text) !== 0 ? '+' : ''}${text} %`;
}

export type ComparisonAxis = 'distance' | 'time';

export const MEASURED_COLOR = '#1a1c1e';
export const MODELLED_COLOR = '#0b5567';

/** x values of the comparison charts: distance in the display unit, or minutes since the trip began. */
export function comparisonX(comparison: ReplayComparison, axis: ComparisonAxis, system: UnitSystem): number[] {
  return axis === 'distance'
    ? comparison.series.distanceM.map((m) => toDisplay('distance', m, system))
    : comparison.series.timeS.map((s) => s / 60);
}

/** Measured and modelled lines of the four compared quantities (measured ones only where logged). */
export function comparisonCharts(comparison: ReplayComparison, axis: ComparisonAxis, system: UnitSystem) {
  const x = comparisonX(comparison, axis, system);
  const s = comparison.series;
  const pair = (
    label: string,
    measured: readonly (number | null)[] | null,
    modelled: readonly number[],
    convert: (v: number) => number,
  ): ChartSeries[] => [
    ...(measured
      ? [{ label: `Measured ${label}`, x, y: measured.map((v) => (v === null ? null : convert(v))), color: MEASURED_COLOR }]
      : []),
    { label: `Modelled ${label}`, x, y: modelled.map(convert), color: MODELLED_COLOR, dashed: true },
  ];
  return {
    power: pair('battery power', s.measuredPowerW, s.modelledPowerW, (w) => toDisplay('power', w, system)),
    energy: pair('energy from the battery', s.measuredEnergyWh, s.modelledEnergyWh, (wh) => toDisplay('energy', wh, system)),
    soc: pair('SOC', s.measuredSoc, s.modelledSoc, (soc) => soc * 100),
    brake: s.measuredBrakeTempC
      ? pair('brake temperature', s.measuredBrakeTempC, s.modelledBrakeTempC, (c) => toDisplay('temperature', c, system))
      : null,
    speed: [
      { label: 'Measured speed', x, y: s.speedMps.map((v) => toDisplay('speed', v, system)), color: MEASURED_COLOR },
      {
        label: 'Elevation',
        x,
        y: s.elevationM.map((m) => toDisplay('elevation', m, system)),
        color: '#8a9499',
        rightAxis: true,
        fill: true,
      },
    ] as ChartSeries[],
  };
}

/** Colours of the trips in a residual plot. */
export const TRIP_COLORS: readonly string[] = ['#0b5567', '#c2570c', '#6a2c91', '#3f7f4f', '#8e1b2c', '#5c6b70'];

/** Residual (measured − modelled battery power) against minutes into each trip, one line per trip. */
export function residualSeries(
  residuals: readonly { name: string; timeS: readonly number[]; residualW: readonly number[] }[],
  system: UnitSystem,
): ChartSeries[] {
  return residuals.map((trip, index) => ({
    label: trip.name,
    x: trip.timeS.map((s) => s / 60),
    y: trip.residualW.map((w) => toDisplay('power', w, system)),
    color: TRIP_COLORS[index % TRIP_COLORS.length]!,
  }));
}
