/**
 * The scenario report as PDF (pdfkit, its built-in Helvetica; nothing is fetched): title, inputs,
 * summary table, descents with risk and advice, the engineering caution, and a chart of elevation
 * and brake temperature along the route drawn with vector paths.
 */
import PDFDocument from 'pdfkit';
import type { Descent } from '@shared/domain/analysis';
import type { Scenario, ScenarioResult } from '@shared/domain/scenarios';
import type { VehicleProfile } from '@shared/domain/vehicle-profiles';
import { ENGINEERING_CAUTION } from '@shared/engine/constants';

const MARGIN = 50;
const RISK_COLOURS: Record<Descent['risk'], string> = { low: '#2e7d32', elevated: '#b58900', high: '#d84315', critical: '#b71c1c' };

export function scenarioReportPdf(scenario: Scenario, result: ScenarioResult, profile: VehicleProfile | undefined): Promise<Buffer> {
  const doc = new PDFDocument({ size: 'A4', margin: MARGIN, info: { Title: `Descentry report – ${scenario.name}`, Creator: 'Descentry' } });
  const chunks: Buffer[] = [];
  doc.on('data', (chunk: Buffer) => chunks.push(chunk));
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });
  const width = doc.page.width - 2 * MARGIN;

  doc.font('Helvetica-Bold').fontSize(18).text(scenario.name);
  doc.font('Helvetica').fontSize(9).fillColor('#555555')
    .text(`Route ${scenario.routeName} (version ${scenario.routeVersion}) · ${scenario.vehicleProfileName} · engine ${result.engineVersion} · computed ${result.computedAt}`);
  doc.moveDown(0.5);
  caution(doc, width);

  heading(doc, 'Inputs');
  const load = scenario.load.kind === 'case' ? `${scenario.load.case} load` : `${scenario.load.passengers} passengers`;
  const season = scenario.season.kind === 'season' ? `${scenario.season.season} season` : `custom (${scenario.season.ambientC} °C, ${(scenario.season.auxPowerW / 1000).toFixed(1)} kW auxiliaries)`;
  table(doc, width, [
    ['Direction', scenario.direction],
    ['Vehicle', `${scenario.vehicleProfileName}${profile ? ` (${profile.vehicleClass})` : ''}`],
    ['Load', load],
    ['Season', season],
    ['Start SOC', `${(scenario.startSoc * 100).toFixed(0)} %`],
    ['Spacing / smoothing', `${scenario.options.spacingM} m / ${scenario.options.smoothingWindowM} m`],
    ['Descent speed cap', scenario.options.descentSpeedCapKph === undefined ? 'none' : `${scenario.options.descentSpeedCapKph} km/h`],
    ['Stops served', scenario.options.useStops ? 'yes' : 'no'],
    ...(scenario.direction === 'round-trip' ? [['Layover', `${scenario.options.layoverS} s`] as [string, string]] : []),
  ]);

  heading(doc, 'Summary');
  const columns = ['', ...result.directions.map((d) => d.direction), ...(result.directions.length > 1 ? ['round trip'] : [])];
  const summaries = [...result.directions.map((d) => d.summary), ...(result.directions.length > 1 ? [result.summary] : [])];
  const rows: [string, (s: (typeof summaries)[number]) => string][] = [
    ['Length', (s) => `${(s.lengthM / 1000).toFixed(2)} km`],
    ['Ascent / descent', (s) => `${s.ascentM.toFixed(0)} / ${s.descentM.toFixed(0)} m`],
    ['Duration', (s) => `${(s.durationS / 60).toFixed(1)} min`],
    ['Traction energy', (s) => kWh(s.tractionEnergyWh)],
    ['Regenerated (into battery/line)', (s) => kWh(s.regenEnergyWh)],
    ['Friction brakes', (s) => kWh(s.frictionBrakeEnergyWh)],
    ['Retarder / resistor', (s) => kWh(s.retarderEnergyWh)],
    ['Auxiliaries', (s) => kWh(s.auxEnergyWh)],
    ['Net from battery/line', (s) => kWh(s.batteryNetEnergyWh)],
    ['Consumption', (s) => `${s.kWhPerKm.toFixed(2)} kWh/km`],
    ['Peak brake temperature', (s) => `${s.peakBrakeTempC.toFixed(0)} °C`],
    // The built-in PDF fonts have no arrow glyph: say it in words.
    ['SOC start to end', (s) => `${(s.startSoc * 100).toFixed(1)} % to ${(s.endSoc * 100).toFixed(1)} %`],
  ];
  grid(doc, width, [columns, ...rows.map(([label, format]) => [label, ...summaries.map(format)])]);

  heading(doc, 'Descents');
  const descents = result.directions.flatMap((d) => d.descents.map((descent) => ({ direction: d.direction, descent })));
  if (descents.length === 0) {
    doc.font('Helvetica').fontSize(9).fillColor('#000000').text('No descent steeper than the threshold and longer than the minimum length.');
  } else {
    grid(
      doc,
      width,
      [
        ['Direction', 'km', 'Drop', 'Mean / max grade', 'Peak brake', 'Risk', 'Max safe speed', 'Max SOC at top'],
        ...descents.map(({ direction, descent }) => [
          direction,
          `${(descent.startM / 1000).toFixed(1)}–${(descent.endM / 1000).toFixed(1)}`,
          `${descent.dropM.toFixed(0)} m`,
          `${descent.meanGradePercent.toFixed(1)} / ${descent.maxGradePercent.toFixed(1)} %`,
          `${descent.peakBrakeTempC.toFixed(0)} °C`,
          descent.risk,
          descent.speedAdvice === 'limit' && descent.maxSafeSpeedKph !== null
            ? `${descent.maxSafeSpeedKph.toFixed(0)} km/h`
            : descent.speedAdvice === 'no-limit-needed'
              ? 'no limit needed'
              : 'not holdable',
          descent.maxTopSoc === null ? '—' : `${(descent.maxTopSoc * 100).toFixed(0)} %`,
        ]),
      ],
      (row) => (row > 0 ? RISK_COLOURS[descents[row - 1]!.descent.risk] : undefined),
    );
  }

  for (const direction of result.directions) {
    if (doc.y > doc.page.height - 280) doc.addPage();
    heading(doc, `Elevation and brake temperature – ${direction.direction}`);
    chart(doc, width, direction.profile.distanceM, direction.profile.elevationM, direction.profile.brakeTempC);
  }
  doc.moveDown(1);
  caution(doc, width);
  doc.end();
  return done;
}

function heading(doc: PDFKit.PDFDocument, text: string) {
  doc.moveDown(0.8).font('Helvetica-Bold').fontSize(12).fillColor('#000000').text(text, MARGIN).moveDown(0.3);
}

function caution(doc: PDFKit.PDFDocument, width: number) {
  // Measure with the font the text is drawn in, or the box comes out too short.
  doc.font('Helvetica-Bold').fontSize(9);
  const height = doc.heightOfString(ENGINEERING_CAUTION, { width: width - 16 }) + 12;
  // Keep the box whole: start a new page rather than split it.
  if (doc.y + height > doc.page.height - doc.page.margins.bottom) doc.addPage();
  const y = doc.y;
  doc.rect(MARGIN, y, width, height).fillAndStroke('#fff4e5', '#d84315');
  doc.fillColor('#000000').font('Helvetica-Bold').fontSize(9).text(ENGINEERING_CAUTION, MARGIN + 8, y + 6, { width: width - 16 });
  doc.y = y + height + 4;
  doc.x = MARGIN;
}

function table(doc: PDFKit.PDFDocument, width: number, rows: [string, string][]) {
  doc.fontSize(9).fillColor('#000000');
  for (const [label, value] of rows) {
    const y = doc.y;
    doc.font('Helvetica-Bold').text(label, MARGIN, y, { width: 150 });
    doc.font('Helvetica').text(value, MARGIN + 160, y, { width: width - 160 });
    doc.y = Math.max(doc.y, y + 12);
  }
}

function grid(doc: PDFKit.PDFDocument, width: number, rows: string[][], colourOf?: (row: number) => string | undefined) {
  const columns = rows[0]!.length;
  const first = Math.min(150, width / columns + 40);
  const rest = (width - first) / Math.max(1, columns - 1);
  doc.fontSize(8);
  rows.forEach((row, index) => {
    if (doc.y > doc.page.height - MARGIN - 20) doc.addPage();
    const y = doc.y;
    let rowHeight = 11;
    row.forEach((cell, column) => {
      const x = column === 0 ? MARGIN : MARGIN + first + (column - 1) * rest;
      const cellWidth = (column === 0 ? first : rest) - 4;
      doc.font(index === 0 || column === 0 ? 'Helvetica-Bold' : 'Helvetica').fillColor(colourOf?.(index) ?? '#000000');
      doc.text(cell, x, y, { width: cellWidth });
      rowHeight = Math.max(rowHeight, doc.y - y);
    });
    doc.y = y + rowHeight + 2;
  });
  doc.x = MARGIN;
  doc.fillColor('#000000');
}

function chart(doc: PDFKit.PDFDocument, width: number, distanceM: number[], elevationM: number[], brakeTempC: number[]) {
  const height = 170;
  const top = doc.y + 5;
  const left = MARGIN + 40;
  const plotWidth = width - 80;
  const maxDistance = Math.max(1, distanceM.at(-1) ?? 1);
  const [zMin, zMax] = paddedRange(elevationM);
  const [tMin, tMax] = paddedRange([...brakeTempC, 0]);
  const x = (s: number) => left + (s / maxDistance) * plotWidth;
  const yz = (z: number) => top + height - ((z - zMin) / (zMax - zMin)) * height;
  const yt = (t: number) => top + height - ((t - tMin) / (tMax - tMin)) * height;
  doc.save().lineWidth(0.5).strokeColor('#999999').rect(left, top, plotWidth, height).stroke().restore();
  const step = Math.max(1, Math.floor(distanceM.length / 800));
  const path = (values: number[], y: (v: number) => number, colour: string) => {
    doc.save().lineWidth(1.2).strokeColor(colour);
    doc.moveTo(x(distanceM[0]!), y(values[0]!));
    for (let i = step; i < distanceM.length; i += step) doc.lineTo(x(distanceM[i]!), y(values[i]!));
    doc.lineTo(x(distanceM.at(-1)!), y(values.at(-1)!)).stroke().restore();
  };
  path(elevationM, yz, '#1565c0');
  path(brakeTempC, yt, '#d84315');
  doc.fontSize(7).fillColor('#1565c0');
  doc.text(`${zMax.toFixed(0)} m`, MARGIN, top - 3, { width: 38, align: 'right' });
  doc.text(`${zMin.toFixed(0)} m`, MARGIN, top + height - 6, { width: 38, align: 'right' });
  doc.fillColor('#d84315');
  doc.text(`${tMax.toFixed(0)} °C`, left + plotWidth + 3, top - 3, { width: 38 });
  doc.text(`${tMin.toFixed(0)} °C`, left + plotWidth + 3, top + height - 6, { width: 38 });
  doc.fillColor('#000000');
  doc.text('0 km', left - 10, top + height + 3, { width: 30 });
  doc.text(`${(maxDistance / 1000).toFixed(1)} km`, left + plotWidth - 30, top + height + 3, { width: 40, align: 'right' });
  doc.fillColor('#1565c0').text('— elevation', left, top + height + 14, { continued: true }).fillColor('#d84315').text('    — brake temperature');
  doc.fillColor('#000000');
  doc.y = top + height + 30;
  doc.x = MARGIN;
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

function kWh(wh: number): string {
  return `${(wh / 1000).toFixed(2)} kWh`;
}
