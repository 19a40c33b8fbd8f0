/**
 * The service-day report as an A4 PDF: what was run, which blocks cannot be worked and why (first),
 * every block's SOC through the day on one chart with the reserve, the blocks' figures, charging
 * stops, peak power per charger site and the descents the day made riskier, with the cautions
 * beside them. Words, units and rounding come from the shared presentation module, as on screen.
 */
import type { ServiceDay, ServiceDayResult } from '@shared/domain/service-days';
import { ENGINEERING_CAUTION } from '@shared/engine/constants';
import {
  ADVICE_CAUTIONS,
  ADVICE_CAUTIONS_TITLE,
  BATTERY_AGE_LABELS,
  BLOCK_COLOURS,
  DAY_TYPE_LABELS,
  DIRECTION_LABELS,
  RESERVE_COLOUR,
  RISK_LABELS,
  SEASON_LABELS,
  SERVICE_DAY_NOT_COVERED,
  CHARGING_PURPOSE_LABELS,
  blockVehicleSentence,
  formatDateTime,
  formatQuantity,
  formatServiceTime,
  formatTemperatureReached,
  orderBlocks,
  riskRank,
  type UnitSystem,
} from '@shared/presentation/index';
import { INK, MUTED, PdfLayout } from './pdf-layout';

/** Printed in metric units, as the authority's own documents. */
const UNITS: UnitSystem = 'metric';
const FAILS = '#b3261e';

export function serviceDayReportPdf(day: ServiceDay, result: ServiceDayResult, routeNames: ReadonlyMap<string, string>): Promise<Buffer> {
  const page = new PdfLayout({ Title: `Descentry service day – ${day.name}` });
  const soc = (value: number) => formatQuantity('soc', value, UNITS);
  const energy = (wh: number) => formatQuantity('energy', wh, UNITS);
  const chargerName = (key: string) => day.chargers.find((charger) => charger.key === key)?.name ?? key;

  page.paragraph(day.name, { size: 18, bold: true }, { gapAfter: 2 });
  page.paragraph(
    `${DAY_TYPE_LABELS[day.dayType]} · ${SEASON_LABELS[day.season]} · ${BATTERY_AGE_LABELS[day.batteryAge]} · reserve ${soc(day.reserveSoc)} · ` +
      `${day.blocks.length} blocks, ${day.chargers.length} chargers · computed ${formatDateTime(result.computedAt)} with engine ${result.engineVersion}`,
    { size: 9, colour: MUTED },
    { gapAfter: 8 },
  );
  page.cautionBox(
    result.caution && result.caution !== ENGINEERING_CAUTION ? `${ENGINEERING_CAUTION} ${result.caution}` : ENGINEERING_CAUTION,
  );
  if (day.isStale)
    page.paragraph(`Out of date: ${day.staleReasons.join(' ') || 'inputs changed after this run.'}`, {
      size: 9,
      bold: true,
      colour: FAILS,
    });

  const blocks = orderBlocks(result.blocks);
  const failing = blocks.filter((block) => !block.feasible);
  page.heading(failing.length === 0 ? 'Every block can be worked' : `${failing.length} of ${blocks.length} blocks cannot be worked`);
  for (const block of failing) {
    page.paragraph(
      `Block ${block.blockId}: lowest SOC ${soc(block.minSoc)}, ends at ${soc(block.endSoc)}.`,
      { size: 9.5, bold: true, colour: FAILS },
      { gapAfter: 1 },
    );
    for (const problem of block.problems) page.paragraph(`• ${problem}`, { size: 9 }, { indent: 10, gapAfter: 1 });
    const why = blockVehicleSentence(block, day.batteryAge, UNITS);
    if (why) page.paragraph(why, { size: 9, colour: MUTED }, { indent: 10, gapAfter: 1 });
    page.y += 3;
  }

  page.heading('SOC through the day');
  socChart(page, result, day.reserveSoc);

  page.heading('Blocks');
  page.table(
    [
      { header: 'Block', weight: 1.3 },
      { header: 'Verdict', weight: 1.4 },
      { header: 'Lowest SOC', weight: 1, align: 'right' },
      { header: 'End SOC', weight: 1, align: 'right' },
      { header: 'Charged into battery', weight: 1.3, align: 'right' },
      { header: 'Net trip energy', weight: 1.3, align: 'right' },
    ],
    blocks.map((block) => [
      block.blockId,
      block.feasible ? 'Works' : 'Cannot be worked',
      soc(block.minSoc),
      soc(block.endSoc),
      energy(block.chargedEnergyWh),
      energy(block.tripNetEnergyWh),
    ]),
    { size: 8.5, rowColour: (row) => (blocks[row]!.feasible ? undefined : FAILS) },
  );

  page.heading('Charging');
  const events = blocks.flatMap((block) => block.chargingEvents.map((event) => ({ blockId: block.blockId, event })));
  if (events.length === 0) page.paragraph('No block charged during the day.', { size: 9 });
  else {
    page.table(
      [
        { header: 'Block', weight: 1.1 },
        { header: 'Charger', weight: 2 },
        { header: 'From–to', weight: 1.3 },
        { header: 'Into battery', weight: 1.1, align: 'right' },
        { header: 'From grid', weight: 1.1, align: 'right' },
        { header: 'SOC before', weight: 1, align: 'right' },
        { header: 'SOC after', weight: 1, align: 'right' },
      ],
      events.map(({ blockId, event }) => [
        blockId,
        event.purpose === 'preconditioning'
          ? `${chargerName(event.chargerKey)} (${CHARGING_PURPOSE_LABELS.preconditioning.toLowerCase()})`
          : chargerName(event.chargerKey),
        `${formatServiceTime(event.startS)}–${formatServiceTime(event.endS)}`,
        energy(event.energyWh),
        energy(event.gridEnergyWh),
        soc(event.socBefore),
        soc(event.socAfter),
      ]),
    );
  }
  page.heading('Peak charging power per charger site', 11);
  if (result.peakChargingPowerW.length === 0) page.paragraph('No charger was used.', { size: 9 });
  else {
    page.table(
      [
        { header: 'Charger', weight: 3 },
        { header: 'Peak grid power', weight: 1, align: 'right' },
      ],
      [...result.peakChargingPowerW]
        .sort((a, b) => b.powerW - a.powerW)
        .map((peak) => [chargerName(peak.chargerKey), formatQuantity('power', peak.powerW, UNITS)]),
    );
  }

  page.heading('Descents the day made riskier');
  page.paragraph(
    'Each descent is assessed with the SOC and brake temperature the vehicle arrives with after the trips and layovers before it; ' +
      'listed are those whose risk is higher than when the same descent is run alone from a cold start.',
    { size: 9, colour: MUTED },
  );
  page.cautionList(ADVICE_CAUTIONS_TITLE, ADVICE_CAUTIONS);
  const worsened = blocks
    .flatMap((block) => block.descents.filter((descent) => descent.worsenedByDay).map((descent) => ({ blockId: block.blockId, descent })))
    .sort((a, b) => riskRank(b.descent.risk) - riskRank(a.descent.risk) || b.descent.peakBrakeTempC - a.descent.peakBrakeTempC);
  if (worsened.length === 0) page.paragraph('No descent is riskier in the day than on its own.', { size: 9 });
  else {
    page.table(
      [
        { header: 'Block', weight: 1 },
        { header: 'Trip', weight: 2.2 },
        { header: 'Drop', weight: 0.8, align: 'right' },
        { header: 'SOC at top', weight: 0.9, align: 'right' },
        { header: 'Brakes at top', weight: 1, align: 'right' },
        { header: 'Peak brakes', weight: 1, align: 'right' },
        { header: 'Alone', weight: 0.9 },
        { header: 'In the day', weight: 0.9 },
      ],
      worsened.map(({ blockId, descent }) => [
        blockId,
        `${descent.tripIndex + 1} · ${routeNames.get(descent.routeId) ?? 'route'} ${DIRECTION_LABELS[descent.direction].toLowerCase()}`,
        formatQuantity('elevation', descent.dropM, UNITS),
        soc(descent.arrivalSoc),
        formatTemperatureReached(descent.arrivalBrakeTempC, UNITS),
        formatTemperatureReached(descent.peakBrakeTempC, UNITS),
        RISK_LABELS[descent.standaloneRisk],
        RISK_LABELS[descent.risk],
      ]),
    );
  }
  page.paragraph(SERVICE_DAY_NOT_COVERED, { size: 8.5, colour: MUTED });
  return page.end();
}

/** Every block's SOC against the time of day, the reserve dashed, drawn with vector paths. */
function socChart(page: PdfLayout, result: ServiceDayResult, reserveSoc: number): void {
  const height = 190;
  const legendRows = Math.ceil(result.blocks.length / 4);
  page.ensureSpace(height + 24 + legendRows * 12);
  const doc = page.doc;
  const left = page.left + 34;
  const right = page.left + page.width - 6;
  const top = page.y + 4;
  const bottom = top + height - 28;
  const times = result.blocks.flatMap((block) => block.socTrace.map((point) => point.timeS));
  const fromS = times.length ? Math.floor(Math.min(...times) / 3600) * 3600 : 6 * 3600;
  const toS = times.length ? Math.max(fromS + 3600, Math.ceil(Math.max(...times) / 3600) * 3600) : 22 * 3600;
  const x = (timeS: number) => left + ((timeS - fromS) / (toS - fromS)) * (right - left);
  const y = (soc: number) => bottom - soc * (bottom - top);

  doc.save().lineWidth(0.5).strokeColor('#c9d1d6');
  for (let soc = 0; soc <= 1.0001; soc += 0.25) {
    doc.moveTo(left, y(soc)).lineTo(right, y(soc)).stroke();
    page.apply({ size: 7, colour: MUTED });
    doc.text(`${Math.round(soc * 100)} %`, page.left, y(soc) - 4, { width: 30, align: 'right' });
  }
  const stepS = toS - fromS > 12 * 3600 ? 2 * 3600 : 3600;
  for (let timeS = fromS; timeS <= toS; timeS += stepS) {
    page.apply({ size: 7, colour: MUTED });
    // Kept inside the margins: the last label is drawn ending at the chart's right edge.
    const labelX = Math.min(x(timeS) - 15, page.left + page.width - 30);
    doc.text(formatServiceTime(timeS), labelX, bottom + 4, { width: 30, align: labelX < x(timeS) - 15 ? 'right' : 'center' });
  }
  doc.restore();
  result.blocks.forEach((block, index) => {
    if (block.socTrace.length < 2) return;
    doc
      .save()
      .lineWidth(1.2)
      .strokeColor(BLOCK_COLOURS[index % BLOCK_COLOURS.length]!);
    block.socTrace.forEach((point, i) => (i === 0 ? doc.moveTo(x(point.timeS), y(point.soc)) : doc.lineTo(x(point.timeS), y(point.soc))));
    doc.stroke().restore();
  });
  doc
    .save()
    .lineWidth(1)
    .strokeColor(RESERVE_COLOUR)
    .dash(4, { space: 3 })
    .moveTo(left, y(reserveSoc))
    .lineTo(right, y(reserveSoc))
    .stroke()
    .undash()
    .restore();
  page.y = bottom + 18;
  // Legend: one entry per block, four to a row, and the reserve.
  const entries = [
    ...result.blocks.map((block, index) => ({ label: `Block ${block.blockId}`, colour: BLOCK_COLOURS[index % BLOCK_COLOURS.length]! })),
    { label: `Reserve ${Math.round(reserveSoc * 100)} %`, colour: RESERVE_COLOUR },
  ];
  const columnWidth = page.width / 4;
  entries.forEach((entry, index) => {
    const column = index % 4;
    if (index > 0 && column === 0) page.y += 12;
    const ex = page.left + column * columnWidth;
    doc
      .save()
      .rect(ex, page.y + 3, 12, 3)
      .fill(entry.colour)
      .restore();
    page.apply({ size: 7.5, colour: INK });
    doc.text(entry.label, ex + 16, page.y, { width: columnWidth - 18, lineBreak: false, ellipsis: true });
  });
  page.y += 18;
}
