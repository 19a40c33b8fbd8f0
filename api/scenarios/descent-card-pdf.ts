/**
 * Descent cards for the depot: one A4 page per descent of a scenario's stored result, printed
 * for the engineers who brief drivers. Each card shows the descent drawn as a line (north up,
 * with a scale bar; no map tiles, so it prints without any network), its elevation profile, the
 * advice under the worst credible case (speed, retarder use), where the modelled brakes get hot
 * enough to plan a cooling stop, the advice cautions and sign-off fields. A card is marked as not
 * for drivers until a licensed engineer has signed it off.
 *
 * Labels, units and rounding come from shared/presentation, as on the screens and in the report.
 */
import type { Descent, RetarderType } from '@shared/domain/analysis';
import type { DirectionResult, Scenario, ScenarioResult } from '@shared/domain/scenarios';
import {
  ADVICE_CAUTIONS,
  ADVICE_CAUTIONS_TITLE,
  DIRECTION_LABELS,
  RISK_LABELS,
  formatDateTime,
  formatNumber,
  formatQuantity,
  formatSafeSpeed,
  formatStretch,
  formatTemperatureLimit,
  formatTemperatureReached,
  type UnitSystem,
} from '@shared/presentation/index';
import { INK, MUTED, PdfLayout } from '../pdf/pdf-layout';

const UNITS: UnitSystem = 'metric';
const LINE_INK = '#a23b12';
const NOT_FOR_DRIVERS = 'Not for drivers without engineering sign-off.';

/** Mean Earth radius for the card's local plane drawing, m (IUGG mean radius R1, from memory). */
const EARTH_RADIUS_M = 6_371_008.8;

export interface DescentCardContext {
  scenario: Pick<Scenario, 'name' | 'routeName' | 'vehicleProfileName'>;
  result: Pick<ScenarioResult, 'computedAt' | 'engineVersion'>;
  retarderType: RetarderType;
}

export interface CardDescent {
  direction: DirectionResult['direction'];
  descent: Descent;
  profile: DirectionResult['profile'];
}

/** Every descent of the result, in direction order, as cards. */
export function cardDescentsOf(directions: readonly DirectionResult[]): CardDescent[] {
  return directions.flatMap((direction) =>
    direction.descents.map((descent) => ({ direction: direction.direction, descent, profile: direction.profile })),
  );
}

export function descentCardsPdf(context: DescentCardContext, cards: readonly CardDescent[]): Promise<Buffer> {
  const page = new PdfLayout({ Title: `Descentry descent cards – ${context.scenario.name}` });
  cards.forEach((card, index) => {
    if (index > 0) page.newPage();
    descentCard(page, context, card);
  });
  return page.end();
}

function descentCard(page: PdfLayout, context: DescentCardContext, { direction, descent, profile }: CardDescent): void {
  const { doc } = page;
  page.paragraph(`Descent card: ${context.scenario.routeName}`, { size: 16, bold: true }, { gapAfter: 1 });
  page.paragraph(
    `${DIRECTION_LABELS[direction]}, ${formatStretch(descent.startM, descent.endM, UNITS)} · ${context.scenario.vehicleProfileName} · ` +
      `scenario “${context.scenario.name}”, computed ${formatDateTime(context.result.computedAt)} (engine ${context.result.engineVersion})`,
    { size: 8.5, colour: MUTED },
  );
  // The warning band across the top: a card is an engineer's working paper until signed off.
  const bandHeight = 18;
  doc.save().rect(page.left, page.y, page.width, bandHeight).fill('#8a1c4a').restore();
  page.apply({ size: 10, bold: true, colour: '#ffffff' });
  doc.text(NOT_FOR_DRIVERS, page.left + 8, page.y + 4, { width: page.width - 16, lineBreak: false });
  page.y += bandHeight + 6;

  const slice = sliceOf(profile, descent);
  const top = page.y;
  const mapWidth = page.width * 0.46;
  const mapHeight = 200;
  drawLine(page, slice, page.left, top, mapWidth, mapHeight);
  const chartLeft = page.left + mapWidth + 14;
  drawProfile(page, slice, descent, chartLeft, top, page.width - mapWidth - 14, mapHeight);
  page.y = top + mapHeight + 26;

  const worst = descent.worstCase;
  page.heading('Advice under the worst credible case', 11, { gapBefore: 0 });
  page.keyValues(
    [
      [
        'Descent',
        `drop ${formatQuantity('elevation', descent.dropM, UNITS)}, mean grade ${formatQuantity('grade', Math.abs(descent.meanGradePercent), UNITS)} down, steepest ${formatQuantity('grade', Math.abs(descent.maxGradePercent), UNITS)}`,
      ],
      ['Risk', `${RISK_LABELS[descent.risk]} (worst case); fade threshold ${formatTemperatureLimit(descent.fadeThresholdC, UNITS)}`],
      ['Advised speed', speedLine(worst?.speedAdvice ?? descent.speedAdvice, worst?.maxSafeSpeedKph ?? descent.maxSafeSpeedKph)],
      ['Retarder and regeneration', retarderLine(context.retarderType, worst?.conditions.retarderAvailable ?? false)],
      ['Where to stop to cool', coolingLine(slice, descent)],
      [
        'Worst case taken',
        worst ? conditionsLine(worst.conditions) : 'Not computed for this result: re-run the scenario to get the worst case.',
      ],
    ],
    { labelWidth: 130, size: 8.5 },
  );
  page.cautionList(ADVICE_CAUTIONS_TITLE, ADVICE_CAUTIONS, { size: 8 });
  signOffFields(page);
}

interface Slice {
  distanceM: number[];
  elevationM: number[];
  brakeTempC: number[];
  lon: number[];
  lat: number[];
}

function sliceOf(profile: DirectionResult['profile'], descent: Descent): Slice {
  const slice: Slice = { distanceM: [], elevationM: [], brakeTempC: [], lon: [], lat: [] };
  profile.distanceM.forEach((distanceM, index) => {
    if (distanceM < descent.startM || distanceM > descent.endM) return;
    slice.distanceM.push(distanceM);
    slice.elevationM.push(profile.elevationM[index] ?? 0);
    slice.brakeTempC.push(profile.brakeTempC[index] ?? 0);
    if (profile.lon.length === profile.distanceM.length) {
      slice.lon.push(profile.lon[index]!);
      slice.lat.push(profile.lat[index]!);
    }
  });
  return slice;
}

/** The descent's line, north up, on a local plane around its middle, with a scale bar and north arrow. */
function drawLine(page: PdfLayout, slice: Slice, left: number, top: number, width: number, height: number): void {
  const { doc } = page;
  doc.save().lineWidth(0.6).strokeColor('#999999').rect(left, top, width, height).stroke().restore();
  page.apply({ size: 7.5, bold: true, colour: INK });
  doc.text('The descent, north up', left + 6, top + 5, { width: width - 12, lineBreak: false });
  if (slice.lon.length < 2) {
    page.apply({ size: 8, colour: MUTED });
    doc.text('The route positions of this stretch are not stored; re-run the scenario to draw it.', left + 10, top + height / 2 - 10, {
      width: width - 20,
    });
    return;
  }
  const midLat = ((Math.min(...slice.lat) + Math.max(...slice.lat)) / 2) * (Math.PI / 180);
  const lon0 = slice.lon[0]!;
  const lat0 = slice.lat[0]!;
  // Equirectangular projection around the stretch: metres east and north of its top.
  const xs = slice.lon.map((lon) => (((lon - lon0) * Math.PI) / 180) * EARTH_RADIUS_M * Math.cos(midLat));
  const ys = slice.lat.map((lat) => (((lat - lat0) * Math.PI) / 180) * EARTH_RADIUS_M);
  const pad = 22;
  const spanX = Math.max(1, Math.max(...xs) - Math.min(...xs));
  const spanY = Math.max(1, Math.max(...ys) - Math.min(...ys));
  const scale = Math.min((width - 2 * pad) / spanX, (height - 2 * pad - 24) / spanY);
  const originX = left + width / 2 - ((Math.min(...xs) + Math.max(...xs)) / 2) * scale;
  const originY = top + (height - 24) / 2 + 8 + ((Math.min(...ys) + Math.max(...ys)) / 2) * scale;
  const px = (x: number) => originX + x * scale;
  const py = (y: number) => originY - y * scale;
  doc.save().lineWidth(2.4).strokeColor(LINE_INK).lineJoin('round').lineCap('round');
  doc.moveTo(px(xs[0]!), py(ys[0]!));
  for (let index = 1; index < xs.length; index++) doc.lineTo(px(xs[index]!), py(ys[index]!));
  doc.stroke().restore();
  // Top (start) as a filled dot, bottom (end) as a ring.
  doc.save().fillColor(INK).circle(px(xs[0]!), py(ys[0]!), 3.5).fill().restore();
  doc
    .save()
    .lineWidth(1.2)
    .strokeColor(INK)
    .circle(px(xs.at(-1)!), py(ys.at(-1)!), 3.5)
    .stroke()
    .restore();
  page.apply({ size: 7, colour: INK });
  doc.text('top', px(xs[0]!) + 5, py(ys[0]!) - 4, { lineBreak: false });
  doc.text('bottom', px(xs.at(-1)!) + 5, py(ys.at(-1)!) - 4, { lineBreak: false });

  // North arrow, top right.
  const arrowX = left + width - 16;
  const arrowY = top + 22;
  doc
    .save()
    .fillColor(INK)
    .moveTo(arrowX, arrowY - 8)
    .lineTo(arrowX - 4, arrowY + 4)
    .lineTo(arrowX + 4, arrowY + 4)
    .closePath()
    .fill()
    .restore();
  page.apply({ size: 7, bold: true, colour: INK });
  doc.text('N', arrowX - 3, arrowY + 5, { lineBreak: false });

  // Scale bar: a round length near a quarter of the box.
  const barM = roundLength(width / 4 / scale);
  const barPt = barM * scale;
  const barY = top + height - 14;
  doc
    .save()
    .lineWidth(1.5)
    .strokeColor(INK)
    .moveTo(left + 10, barY)
    .lineTo(left + 10 + barPt, barY)
    .stroke();
  doc
    .moveTo(left + 10, barY - 3)
    .lineTo(left + 10, barY + 3)
    .moveTo(left + 10 + barPt, barY - 3)
    .lineTo(left + 10 + barPt, barY + 3)
    .stroke()
    .restore();
  page.apply({ size: 7, colour: INK });
  doc.text(barM >= 1_000 ? `${formatNumber(barM / 1_000)} km` : `${barM} m`, left + 14 + barPt, barY - 4, { lineBreak: false });
}

/** 1, 2 or 5 times a power of ten, at most `metres`. */
function roundLength(metres: number): number {
  const power = 10 ** Math.floor(Math.log10(Math.max(1, metres)));
  for (const factor of [5, 2, 1]) if (factor * power <= metres) return factor * power;
  return power;
}

/** Elevation along the descent, with the distance from its top. */
function drawProfile(page: PdfLayout, slice: Slice, descent: Descent, left: number, top: number, width: number, height: number): void {
  const { doc } = page;
  doc.save().lineWidth(0.6).strokeColor('#999999').rect(left, top, width, height).stroke().restore();
  page.apply({ size: 7.5, bold: true, colour: INK });
  doc.text('Elevation profile', left + 6, top + 5, { width: width - 12, lineBreak: false });
  if (slice.distanceM.length < 2) return;
  const axis = 40;
  const plotLeft = left + axis;
  const plotTop = top + 20;
  const plotWidth = width - axis - 10;
  const plotHeight = height - 44;
  const zMin = Math.min(...slice.elevationM);
  const zMax = Math.max(zMin + 1, Math.max(...slice.elevationM));
  const x = (s: number) => plotLeft + ((s - descent.startM) / Math.max(1, descent.endM - descent.startM)) * plotWidth;
  const y = (z: number) => plotTop + plotHeight - ((z - zMin) / (zMax - zMin)) * plotHeight;
  doc.save().lineWidth(1.4).strokeColor('#1565c0');
  doc.moveTo(x(slice.distanceM[0]!), y(slice.elevationM[0]!));
  for (let index = 1; index < slice.distanceM.length; index++) doc.lineTo(x(slice.distanceM[index]!), y(slice.elevationM[index]!));
  doc.stroke().restore();
  const cooling = coolingPoint(slice, descent);
  if (cooling !== null) {
    doc
      .save()
      .lineWidth(1)
      .dash(3, { space: 2 })
      .strokeColor(LINE_INK)
      .moveTo(x(cooling.distanceM), plotTop)
      .lineTo(x(cooling.distanceM), plotTop + plotHeight)
      .stroke()
      .restore();
  }
  page.apply({ size: 7, colour: INK });
  doc.text(`${formatNumber(zMax)} m`, left + 2, plotTop - 3, { width: axis - 6, align: 'right', lineBreak: false });
  doc.text(`${formatNumber(zMin)} m`, left + 2, plotTop + plotHeight - 6, { width: axis - 6, align: 'right', lineBreak: false });
  doc.text('0 km', plotLeft, plotTop + plotHeight + 3, { lineBreak: false });
  doc.text(formatQuantity('distance', descent.endM - descent.startM, UNITS, 1), plotLeft + plotWidth - 60, plotTop + plotHeight + 3, {
    width: 60,
    align: 'right',
    lineBreak: false,
  });
  page.apply({ size: 6.5, colour: MUTED });
  doc.text(
    cooling === null ? 'Distance from the top of the descent.' : 'Dashed: plan a cooling stop before this point.',
    plotLeft,
    plotTop + plotHeight + 12,
    { width: plotWidth, lineBreak: false },
  );
}

/** The advice's limit: the fade threshold less the margin the advice keeps, °C. */
function advisoryLimitC(descent: Descent): number {
  return descent.fadeThresholdC - (descent.fadeMarginK ?? 0);
}

/**
 * Where the modelled brakes (regeneration working) first reach the advisory limit: a cooling stop
 * belongs before it. null when they stay below it on the whole descent.
 */
function coolingPoint(slice: Slice, descent: Descent): { distanceM: number; tempC: number } | null {
  const limitC = advisoryLimitC(descent);
  const index = slice.brakeTempC.findIndex((tempC) => tempC >= limitC);
  return index === -1 ? null : { distanceM: slice.distanceM[index]!, tempC: slice.brakeTempC[index]! };
}

function coolingLine(slice: Slice, descent: Descent): string {
  const point = coolingPoint(slice, descent);
  const worstHotter = descent.worstCase && descent.worstCase.peakBrakeTempC > descent.peakBrakeTempC;
  if (point === null) {
    const limit = formatTemperatureLimit(advisoryLimitC(descent), UNITS);
    return (
      `With regeneration working the brakes stay below ${limit} on this descent, so no cooling stop is planned` +
      (worstHotter && descent.worstCase!.peakBrakeTempC >= advisoryLimitC(descent)
        ? `; with regeneration lost they pass it (${formatTemperatureReached(descent.worstCase!.peakBrakeTempC, UNITS)}): keep to the advised speed. `
        : '. ') +
      'Stop at the next safe place if a brake warning shows or the brakes smell hot.'
    );
  }
  return (
    `Plan a stop at a safe place before ${formatQuantity('distance', point.distanceM - descent.startM, UNITS, 1)} from the top ` +
    `(route ${formatQuantity('distance', point.distanceM, UNITS, 1)}), where the modelled brakes reach ${formatTemperatureReached(point.tempC, UNITS)} with regeneration working` +
    (worstHotter ? '; without regeneration they get there sooner, so choose the stop earlier.' : '.')
  );
}

function speedLine(advice: Descent['speedAdvice'], speedKph: number | null): string {
  switch (advice) {
    case 'limit':
      return `At or below ${formatSafeSpeed(speedKph ?? 0, UNITS)} on the whole descent, even with regeneration lost.`;
    case 'no-limit-needed':
      return 'No lower speed than the posted limits is needed for the brakes, even with regeneration lost.';
    case 'not-holdable':
      return 'No speed keeps the brakes below the advisory limit with regeneration lost: an endurance brake, a lower load or a vehicle restriction is needed before service.';
    case 'not-drivable':
      return 'Not drivable as drawn: part of this descent is beyond the vehicle or the road design limit, so no speed is advised.';
  }
}

function retarderLine(retarderType: RetarderType, retarderAvailable: boolean): string {
  switch (retarderType) {
    case 'none':
      return 'No retarder on this vehicle: regeneration and the friction brakes share the work; with regeneration lost the friction brakes take it all.';
    case 'braking-resistor':
      return 'Keep the braking resistor in use on the whole descent; it works through the motor, so it is lost with regeneration and the advice above does not count on it.';
    case 'hydrodynamic':
    case 'eddy-current':
      return retarderAvailable
        ? 'Engage the retarder at the top and keep it on for the whole descent; the advice above counts on it. Its force falls at low speed.'
        : 'Engage the retarder at the top and keep it on for the whole descent.';
  }
}

function conditionsLine(conditions: NonNullable<Descent['worstCase']>['conditions']): string {
  return [
    'regeneration unavailable',
    conditions.socAtTop === null ? null : `battery at ${Math.round(conditions.socAtTop * 100)} % at the top`,
    `${formatQuantity('mass', conditions.massKg, UNITS)} vehicle mass`,
    `${formatNumber(conditions.ambientC)} °C ambient`,
    `brakes entering at ${formatTemperatureReached(conditions.brakeTempAtTopC, UNITS)}`,
    `${conditions.surface} surface`,
  ]
    .filter((part): part is string => part !== null)
    .join(', ');
}

/** Boxes to sign: the engineer who checked the card, the safety officer, the depot that issues it. */
function signOffFields(page: PdfLayout): void {
  const { doc } = page;
  const rows = ['Checked by (licensed engineer)', 'Approved by (safety officer)', 'Issued to the depot by'];
  const rowHeight = 26;
  page.ensureSpace(rows.length * rowHeight + 20);
  page.apply({ size: 9, bold: true, colour: INK });
  doc.text('Sign-off', page.left, page.y, { lineBreak: false });
  page.y += 14;
  const columns = [0.4, 0.25, 0.2, 0.15];
  const headers = ['', 'Name', 'Signature', 'Date'];
  rows.forEach((row) => {
    let x = page.left;
    columns.forEach((share, column) => {
      const cellWidth = page.width * share;
      doc.save().lineWidth(0.6).strokeColor('#777777').rect(x, page.y, cellWidth, rowHeight).stroke().restore();
      page.apply({ size: column === 0 ? 8 : 6.5, bold: column === 0, colour: column === 0 ? INK : MUTED });
      doc.text(column === 0 ? row : headers[column]!, x + 4, page.y + 4, { width: cellWidth - 8, lineBreak: false });
      x += cellWidth;
    });
    page.y += rowHeight;
  });
  page.y += 6;
  page.apply({ size: 8, bold: true, colour: '#8a1c4a' });
  doc.text(`${NOT_FOR_DRIVERS} Until all three boxes are signed, this card is an engineering working paper.`, page.left, page.y, {
    width: page.width,
  });
}
