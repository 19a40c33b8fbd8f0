/**
 * Columns of the service-day result CSV: one tidy table with a row per block, per charging event
 * and per descent, told apart by the first column; a column that does not concern a row's kind
 * is empty. Units in brackets, as in the per-point export.
 */
export const SERVICE_DAY_COLUMNS = [
  { key: 'row', header: 'Row' },
  { key: 'blockId', header: 'Block' },
  { key: 'feasible', header: 'Can be worked' },
  { key: 'minSocPercent', header: 'Lowest SOC (%)' },
  { key: 'endSocPercent', header: 'SOC at pull-in (%)' },
  { key: 'chargedKWh', header: 'Charged into the battery (kWh)' },
  { key: 'tripNetKWh', header: 'Trips and layovers, net battery energy (kWh)' },
  { key: 'problems', header: 'Problems' },
  { key: 'chargerKey', header: 'Charger' },
  { key: 'start', header: 'From (hh:mm)' },
  { key: 'end', header: 'To (hh:mm)' },
  { key: 'gridKWh', header: 'Drawn from the grid (kWh)' },
  { key: 'socBeforePercent', header: 'SOC before (%)' },
  { key: 'socAfterPercent', header: 'SOC after (%)' },
  { key: 'trip', header: 'Trip' },
  { key: 'direction', header: 'Direction' },
  { key: 'descentFromM', header: 'Descent from (m)' },
  { key: 'descentToM', header: 'Descent to (m)' },
  { key: 'dropM', header: 'Drop (m)' },
  { key: 'arrivalSocPercent', header: 'SOC at the top (%)' },
  { key: 'arrivalBrakeTempC', header: 'Brake temperature at the top (°C)' },
  { key: 'peakBrakeTempC', header: 'Worst-case peak brake temperature (°C)' },
  { key: 'risk', header: 'Risk' },
  { key: 'standaloneRisk', header: 'Risk of the descent alone' },
  { key: 'worsenedByDay', header: 'Worse because of the day' },
] as const;

export type ServiceDayColumnKey = (typeof SERVICE_DAY_COLUMNS)[number]['key'];

/** Row kinds as the first column names them. */
export const SERVICE_DAY_ROW_LABELS = { block: 'block', charging: 'charging', descent: 'descent' } as const;

/** A CSV field, quoted where it holds a comma, a quote or a line break. */
export function csvField(value: string): string {
  return /[",\r\n]/.test(value) ? `"${value.replace(/"/g, '""')}"` : value;
}

export function serviceDayCsvHeader(): string {
  return SERVICE_DAY_COLUMNS.map(({ header }) => csvField(header)).join(',');
}
