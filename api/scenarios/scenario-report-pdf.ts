/**
 * The scenario report as an A4 PDF: title, inputs, the summary figures, descents with risk and
 * advice, the engineering caution, and a chart of elevation and brake temperature per direction
 * drawn with vector paths. Labels, units and rounding come from the shared presentation module,
 * so the report says what the result screen says; the layout keeps every word inside the margins.
 */
import type { Scenario, ScenarioResult } from '@shared/domain/scenarios';
import type { VehicleProfile } from '@shared/domain/vehicle-profiles';
import { ENGINEERING_CAUTION } from '@shared/engine/constants';
import { VEHICLE_PRESETS } from '@shared/engine/vehicle-presets';
import {
  DIRECTION_LABELS,
  RISK_LABELS,
  RISK_STYLES,
  SUMMARY_FIGURES,
  ADVICE_CAUTIONS,
  ADVICE_CAUTIONS_TITLE,
  describeDescentAdvice,
  describeLoad,
  describeSeason,
  formatDateTime,
  formatFigure,
  formatNumber,
  formatQuantity,
  formatStretch,
  formatTemperatureReached,
  type UnitSystem,
} from '@shared/presentation/index';
import { INK, MUTED, PdfLayout } from '../pdf/pdf-layout';

/** The report is printed in metric units, as the authority's own documents. */
const UNITS: UnitSystem = 'metric';

export function scenarioReportPdf(scenario: Scenario, result: ScenarioResult, profile: VehicleProfile | undefined): Promise<Buffer> {
  const page = new PdfLayout({ Title: `Descentry report – ${scenario.name}` });

  page.paragraph(scenario.name, { size: 18, bold: true }, { gapAfter: 2 });
  page.paragraph(
    `Route ${scenario.routeName} (version ${scenario.routeVersion}) · ${scenario.vehicleProfileName} · ` +
      `computed ${formatDateTime(result.computedAt)} with engine ${result.engineVersion}`,
    { size: 9, colour: MUTED },
    { gapAfter: 8 },
  );
  page.cautionBox(ENGINEERING_CAUTION);

  page.heading('Inputs');
  const vehicleClass = profile ? VEHICLE_PRESETS.find((preset) => preset.id === profile.vehicleClass)?.name : undefined;
  const options = scenario.options;
  page.keyValues([
    ['Direction', DIRECTION_LABELS[scenario.direction]],
    [
      'Vehicle profile',
      `${scenario.vehicleProfileName}${vehicleClass && vehicleClass !== scenario.vehicleProfileName ? ` (class: ${vehicleClass})` : ''}`,
    ],
    ['Load', describeLoad(scenario.load)],
    ['Season', describeSeason(scenario.season)],
    ['SOC at the start', formatQuantity('soc', scenario.startSoc, UNITS)],
    ['Spacing / smoothing', `${formatNumber(options.spacingM)} m / ${formatNumber(options.smoothingWindowM)} m`],
    ['Descent speed cap', options.descentSpeedCapKph === undefined ? 'None' : `${formatNumber(options.descentSpeedCapKph)} km/h`],
    ['Stops served', options.useStops ? 'Yes, with their dwell times' : 'No'],
    ...(scenario.direction === 'round-trip'
      ? [['Layover between directions', formatQuantity('duration', options.layoverS, UNITS)] as const]
      : []),
  ]);

  page.heading('Summary');
  const directions = result.directions;
  const summaries = [...directions.map((direction) => direction.summary), ...(directions.length > 1 ? [result.summary] : [])];
  const headers = [
    ...directions.map((direction) => DIRECTION_LABELS[direction.direction]),
    ...(directions.length > 1 ? ['Round trip'] : []),
  ];
  page.table(
    [{ header: 'Figure', weight: 2.2 }, ...headers.map((header) => ({ header, weight: 1, align: 'right' as const }))],
    [
      ...SUMMARY_FIGURES.map((figure) => [figure.label, ...summaries.map((summary) => formatFigure(figure, summary, UNITS))]),
      ['SOC at the start', ...summaries.map((summary) => formatQuantity('soc', summary.startSoc, UNITS))],
    ],
    { size: 8.5 },
  );

  page.heading('Descents');
  const descents = directions.flatMap((direction) => direction.descents.map((descent) => ({ direction: direction.direction, descent })));
  if (descents.length === 0) {
    page.paragraph('No descent steeper than the threshold and longer than the minimum length.', { size: 9 });
  } else {
    page.table(
      [
        { header: 'Direction and stretch', weight: 1.5 },
        { header: 'Risk', weight: 0.8 },
        { header: 'Drop, mean / steepest grade', weight: 1.5 },
        { header: 'Peak brake temperature', weight: 1, align: 'right' },
        { header: 'Advice (rounded toward safety)', weight: 3 },
      ],
      descents.map(({ direction, descent }) => {
        const advice = describeDescentAdvice(descent, UNITS);
        return [
          `${DIRECTION_LABELS[direction]}, ${formatStretch(descent.startM, descent.endM, UNITS)}`,
          RISK_LABELS[descent.risk],
          `${formatQuantity('elevation', descent.dropM, UNITS)}, ${formatQuantity('grade', Math.abs(descent.meanGradePercent), UNITS)} / ` +
            `${formatQuantity('grade', Math.abs(descent.maxGradePercent), UNITS)} down`,
          formatTemperatureReached(descent.peakBrakeTempC, UNITS),
          `${advice.speedHeadline}. ${advice.socHeadline}.`,
        ];
      }),
      { rowColour: (row) => RISK_STYLES[descents[row]!.descent.risk].ink },
    );
    page.cautionList(ADVICE_CAUTIONS_TITLE, ADVICE_CAUTIONS);
  }

  for (const direction of directions) {
    page.heading(`Elevation and brake temperature, ${DIRECTION_LABELS[direction.direction]}`);
    chart(page, direction.profile.distanceM, direction.profile.elevationM, direction.profile.brakeTempC);
  }
  page.cautionBox(ENGINEERING_CAUTION);
  return page.end();
}

/** Elevation (left axis) and brake temperature (right axis) along the route, kept on one page. */
function chart(page: PdfLayout, distanceM: number[], elevationM: number[], brakeTempC: number[]) {
  const { doc } = page;
  const plotHeight = 160;
  const axisWidth = 44;
  page.ensureSpace(plotHeight + 44);
  const top = page.y + 6;
  const left = page.left + axisWidth;
  const plotWidth = page.width - 2 * axisWidth;
  const maxDistance = Math.max(1, distanceM.at(-1) ?? 1);
  const [zMin, zMax] = paddedRange(elevationM);
  const [tMin, tMax] = paddedRange([...brakeTempC, 0]);
  const x = (s: number) => left + (s / maxDistance) * plotWidth;
  const yz = (z: number) => top + plotHeight - ((z - zMin) / (zMax - zMin)) * plotHeight;
  const yt = (t: number) => top + plotHeight - ((t - tMin) / (tMax - tMin)) * plotHeight;
  doc.save().lineWidth(0.5).strokeColor('#999999').rect(left, top, plotWidth, plotHeight).stroke().restore();
  const step = Math.max(1, Math.floor(distanceM.length / 800));
  const path = (values: number[], y: (v: number) => number, colour: string) => {
    doc.save().lineWidth(1.2).strokeColor(colour);
    doc.moveTo(x(distanceM[0]!), y(values[0]!));
    for (let i = step; i < distanceM.length; i += step) doc.lineTo(x(distanceM[i]!), y(values[i]!));
    doc
      .lineTo(x(distanceM.at(-1)!), y(values.at(-1)!))
      .stroke()
      .restore();
  };
  path(elevationM, yz, '#1565c0');
  path(brakeTempC, yt, '#c2570c');
  const label = (text: string, atX: number, atY: number, width: number, align: 'left' | 'right', colour: string) => {
    page.apply({ size: 7, colour });
    doc.text(text, atX, atY, { width, align, lineBreak: false });
  };
  label(`${formatNumber(zMax)} m`, page.left, top - 3, axisWidth - 4, 'right', '#1565c0');
  label(`${formatNumber(zMin)} m`, page.left, top + plotHeight - 6, axisWidth - 4, 'right', '#1565c0');
  label(`${formatNumber(tMax)} °C`, left + plotWidth + 4, top - 3, axisWidth - 4, 'left', '#c2570c');
  label(`${formatNumber(tMin)} °C`, left + plotWidth + 4, top + plotHeight - 6, axisWidth - 4, 'left', '#c2570c');
  label('0 km', left, top + plotHeight + 3, 40, 'left', INK);
  label(formatQuantity('distance', maxDistance, UNITS, 1), left + plotWidth - 60, top + plotHeight + 3, 60, 'right', INK);
  label('Blue: elevation (left scale). Orange: brake temperature (right scale).', left, top + plotHeight + 15, plotWidth, 'left', MUTED);
  page.y = top + plotHeight + 32;
}

function paddedRange(values: number[]): [number, number] {
  let min = Number.POSITIVE_INFINITY;
  let max = Number.NEGATIVE_INFINITY;
  for (const v of values) {
    if (v < min) min = v;
    if (v > max) max = v;
  }
  if (!Number.isFinite(min)) return [0, 1];
  if (max - min < 1) return [min - 1, max + 1];
  const pad = (max - min) * 0.05;
  return [min - pad, max + pad];
}
