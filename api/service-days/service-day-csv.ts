/**
 * The service-day result as CSV: the caution as a "#" comment on the first line, then the header
 * from the shared presentation module and one row per block, per charging event and per descent
 * (the first column says which). Brake temperatures are rounded up to the whole degree and SOC
 * kept to 0.1 %, as the screens show them.
 */
import type { ServiceDayResult } from '@shared/domain/service-days';
import {
  DIRECTION_LABELS,
  RISK_LABELS,
  SERVICE_DAY_COLUMNS,
  csvField,
  serviceDayCsvHeader,
  type ServiceDayColumnKey,
} from '@shared/presentation/index';

type Row = Partial<Record<ServiceDayColumnKey, string>>;

export function serviceDayCsv(result: ServiceDayResult): string {
  const lines = [`# ${result.caution.replace(/[\r\n]+/g, ' ')}`, serviceDayCsvHeader()];
  const push = (row: Row) => lines.push(SERVICE_DAY_COLUMNS.map(({ key }) => csvField(row[key] ?? '')).join(','));
  for (const block of result.blocks) {
    push({
      row: 'block',
      blockId: block.blockId,
      feasible: block.feasible ? 'yes' : 'no',
      minSocPercent: percent(block.minSoc),
      endSocPercent: percent(block.endSoc),
      chargedKWh: kWh(block.chargedEnergyWh),
      tripNetKWh: kWh(block.tripNetEnergyWh),
      problems: block.problems.join('; '),
    });
    for (const event of block.chargingEvents) {
      push({
        row: 'charging',
        blockId: block.blockId,
        chargerKey: event.chargerKey,
        start: clock(event.startS),
        end: clock(event.endS),
        chargedKWh: kWh(event.energyWh),
        gridKWh: kWh(event.gridEnergyWh),
        socBeforePercent: percent(event.socBefore),
        socAfterPercent: percent(event.socAfter),
      });
    }
    for (const descent of block.descents) {
      push({
        row: 'descent',
        blockId: block.blockId,
        trip: String(descent.tripIndex + 1),
        direction: DIRECTION_LABELS[descent.direction],
        descentFromM: descent.startM.toFixed(0),
        descentToM: descent.endM.toFixed(0),
        dropM: descent.dropM.toFixed(1),
        arrivalSocPercent: percent(descent.arrivalSoc),
        arrivalBrakeTempC: String(Math.ceil(descent.arrivalBrakeTempC)),
        peakBrakeTempC: String(Math.ceil(descent.peakBrakeTempC)),
        risk: RISK_LABELS[descent.risk],
        standaloneRisk: RISK_LABELS[descent.standaloneRisk],
        worsenedByDay: descent.worsenedByDay ? 'yes' : 'no',
      });
    }
  }
  return `${lines.join('\r\n')}\r\n`;
}

function percent(share: number): string {
  return (share * 100).toFixed(1);
}

function kWh(wh: number): string {
  return (wh / 1_000).toFixed(3);
}

/** Service time as hh:mm (past 24:00 for trips after midnight, as GTFS writes them). */
function clock(seconds: number): string {
  const h = Math.floor(seconds / 3600);
  const m = Math.round((seconds % 3600) / 60);
  return m === 60 ? `${String(h + 1).padStart(2, '0')}:00` : `${String(h).padStart(2, '0')}:${String(m).padStart(2, '0')}`;
}
