/**
 * The board summary as a one-page A4 PDF: title and date, the totals, a bar chart of each route's
 * yearly regeneration and friction-brake energy drawn with vector paths, the open safety items,
 * the sources of the money and CO2 factors, and the engineering caution.
 *
 * Only PDFKit's built-in Helvetica is used (no font files, nothing fetched); it has no subscript
 * digits, so CO₂ is written CO2.
 */
import PDFDocument from 'pdfkit';
import type { BoardSummary } from '@shared/domain/board-summary';

const PAGE_MARGIN_PT = 40;
const INK = '#1d2730';
const MUTED = '#5b6770';
const REGEN_COLOUR = '#2f7d5b';
const FRICTION_COLOUR = '#c0612b';
/** Routes drawn in the chart; a network with more lists the rest by name under it. */
const MAX_CHART_ROUTES = 12;

/** Renders the summary; resolves with the whole file (a page is small). */
export function renderBoardSummaryPdf(summary: BoardSummary): Promise<Buffer> {
  const doc = new PDFDocument({ size: 'A4', margin: PAGE_MARGIN_PT, info: { Title: 'Descentry network summary', Author: 'Descentry' } });
  const chunks: Buffer[] = [];
  doc.on('data', (chunk: Buffer) => chunks.push(chunk));
  const finished = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });

  const width = doc.page.width - 2 * PAGE_MARGIN_PT;
  const left = PAGE_MARGIN_PT;
  const date = summary.generatedAt.slice(0, 10);

  doc.fillColor(INK).font('Helvetica-Bold').fontSize(20).text('Network summary: braking energy and descent safety', left, PAGE_MARGIN_PT, { width });
  doc.font('Helvetica').fontSize(10).fillColor(MUTED).text(`Descentry, ${date}. In-service scenarios, one per route (the latest computed).`, { width });
  doc.moveDown(0.8);

  // Totals, two columns of label and figure.
  const { totals, settings } = summary;
  const figures: Array<[string, string]> = [
    ['Recoverable by regeneration', `${formatNumber(totals.annualRegenKWh)} kWh per year`],
    ['Its value', `${formatNumber(totals.regenValue)} ${settings.currency} per year`],
    ['CO2 avoided', `${formatNumber(totals.co2AvoidedKg / 1_000, 1)} t per year`],
    ['Into the friction brakes', `${formatNumber(totals.annualFrictionBrakeKWh)} kWh per year`],
    ['Net energy drawn', `${formatNumber(totals.annualNetKWh)} kWh per year`],
    ['Distance driven', `${formatNumber(totals.annualKm)} km per year`],
  ];
  const totalsTop = doc.y;
  figures.forEach(([label, value], index) => {
    const x = left + (index % 2) * (width / 2);
    const y = totalsTop + Math.floor(index / 2) * 34;
    doc.font('Helvetica').fontSize(9).fillColor(MUTED).text(label, x, y, { width: width / 2 - 10 });
    doc.font('Helvetica-Bold').fontSize(13).fillColor(INK).text(value, x, y + 11, { width: width / 2 - 10 });
  });
  doc.y = totalsTop + Math.ceil(figures.length / 2) * 34 + 8;

  drawRouteChart(doc, summary, left, width);

  // Open safety items and the steepest descents.
  const open = summary.openSafetyItems;
  doc.x = left;
  doc.moveDown(0.6);
  doc.font('Helvetica-Bold').fontSize(12).fillColor(INK).text('Open descent safety items', left, doc.y, { width });
  doc.font('Helvetica').fontSize(10).text(
    `Critical: ${open.critical}    High: ${open.high}    Elevated: ${open.elevated}    (raised, in review or reopened)`,
    { width },
  );
  if (summary.steepestDescents.length > 0) {
    doc.moveDown(0.4);
    doc.font('Helvetica-Bold').fontSize(10).text('Steepest descents in service', { width });
    doc.font('Helvetica').fontSize(9);
    for (const descent of summary.steepestDescents) {
      doc.text(
        `${descent.routeName}: km ${(descent.startM / 1_000).toFixed(2)}–${(descent.endM / 1_000).toFixed(2)}, ` +
          `mean grade ${Math.abs(descent.meanGradePercent).toFixed(1)} % down, drop ${Math.round(descent.dropM)} m, risk ${descent.risk}`,
        { width },
      );
    }
  }

  doc.moveDown(0.6);
  doc.font('Helvetica').fontSize(8).fillColor(MUTED);
  doc.text(`Tariff ${settings.energyTariffPerKWh} ${settings.currency}/kWh. Source: ${settings.tariffSource}`, { width });
  doc.text(`Grid factor ${settings.gridEmissionFactorKgPerKWh} kg CO2/kWh. Source: ${settings.emissionFactorSource.replace(/₂/g, '2')}`, { width });
  doc.moveDown(0.4);
  doc.font('Helvetica-Bold').fontSize(9).fillColor(INK).text(`Caution: ${summary.caution}`, { width });

  doc.end();
  return finished;
}

/** Horizontal bars per route: regeneration and friction-brake energy per year, one scale. */
function drawRouteChart(doc: PDFKit.PDFDocument, summary: BoardSummary, left: number, width: number): void {
  const routes = summary.routes.slice(0, MAX_CHART_ROUTES);
  doc.font('Helvetica-Bold').fontSize(12).fillColor(INK).text('Energy per route and year (kWh)', left, doc.y, { width });
  if (routes.length === 0) {
    doc.font('Helvetica').fontSize(10).fillColor(MUTED).text('No scenario is marked in service yet.', { width });
    return;
  }
  const labelWidth = 150;
  const barLeft = left + labelWidth;
  const barSpace = width - labelWidth - 70;
  const rowHeight = 22;
  const largest = Math.max(1, ...routes.flatMap((route) => [route.annualRegenKWh, route.annualFrictionBrakeKWh]));
  let y = doc.y + 6;

  // Legend.
  doc.rect(barLeft, y, 9, 9).fill(REGEN_COLOUR);
  doc.font('Helvetica').fontSize(8).fillColor(INK).text('regeneration', barLeft + 13, y + 1);
  doc.rect(barLeft + 90, y, 9, 9).fill(FRICTION_COLOUR);
  doc.fillColor(INK).text('friction brakes', barLeft + 103, y + 1);
  y += 16;

  for (const route of routes) {
    doc.font('Helvetica').fontSize(8).fillColor(INK).text(route.routeName, left, y + 5, { width: labelWidth - 8, ellipsis: true, height: 10 });
    const regenW = (route.annualRegenKWh / largest) * barSpace;
    const frictionW = (route.annualFrictionBrakeKWh / largest) * barSpace;
    doc.rect(barLeft, y, Math.max(regenW, 0.5), 9).fill(REGEN_COLOUR);
    doc.rect(barLeft, y + 10, Math.max(frictionW, 0.5), 9).fill(FRICTION_COLOUR);
    doc.fontSize(7).fillColor(MUTED);
    doc.text(formatNumber(route.annualRegenKWh), barLeft + regenW + 4, y + 1, { lineBreak: false });
    doc.text(formatNumber(route.annualFrictionBrakeKWh), barLeft + frictionW + 4, y + 11, { lineBreak: false });
    y += rowHeight;
  }
  // Baseline of the bars.
  doc.moveTo(barLeft, y - rowHeight * routes.length - 2).lineTo(barLeft, y).lineWidth(0.5).strokeColor(MUTED).stroke();
  if (summary.routes.length > routes.length) {
    doc.font('Helvetica').fontSize(8).fillColor(MUTED).text(`… and ${summary.routes.length - routes.length} more routes (see the web summary).`, left, y, { width });
    y += 12;
  }
  doc.x = left;
  doc.y = y + 4;
}

function formatNumber(value: number, fractionDigits = 0): string {
  return value.toLocaleString('en-GB', { minimumFractionDigits: fractionDigits, maximumFractionDigits: fractionDigits });
}
