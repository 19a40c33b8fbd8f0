/**
 * The board summary as an A4 PDF: title and date, the headline figures (placeholder factors say
 * so beside the figure), a bar chart of each route's yearly regeneration and friction-brake energy
 * drawn with vector paths, the open and accepted safety items, the steepest descents, the sources
 * of the money and CO₂ factors and the engineering caution. Wording and numbers come from the
 * shared presentation module, as on the web page; the layout keeps every word inside the margins.
 */
import type { BoardSummary } from '@shared/domain/board-summary';
import {
  ADVICE_CAUTIONS,
  ADVICE_CAUTIONS_TITLE,
  DIRECTION_LABELS,
  RISK_LABELS,
  annualBasisInBrief,
  boardFigures,
  boardYear,
  boardSafetyCounts,
  formatBoardNumber,
  formatDateTime,
  formatQuantity,
  formatStretch,
  formatTariff,
} from '@shared/presentation/index';
import { INK, MUTED, PdfLayout, printable } from '../pdf/pdf-layout';

const REGEN_COLOUR = '#2f7d5b';
const FRICTION_COLOUR = '#c0612b';
const WARNING_INK = '#a23b12';
/** Routes drawn in the chart; a network with more lists the rest by count under it. */
const MAX_CHART_ROUTES = 12;

/** Renders the summary; resolves with the whole file. */
export function renderBoardSummaryPdf(summary: BoardSummary): Promise<Buffer> {
  const page = new PdfLayout({ Title: 'Descentry network summary' });
  const year = boardYear(summary);

  page.paragraph('Network summary: braking energy and descent safety', { size: 16, bold: true }, { gapAfter: 2 });
  page.paragraph(
    `Figures as of ${formatDateTime(summary.generatedAt)}. Year: ${year.basis === 'service-days' ? 'the service days in service' : 'each route’s latest in-service scenario'}.`,
    { size: 9, colour: MUTED },
    { gapAfter: 6 },
  );

  // Headline figures, two columns of label, value and (for placeholder factors) the warning.
  const figures = boardFigures(summary);
  const columnWidth = (page.width - 16) / 2;
  for (let index = 0; index < figures.length; index += 2) {
    const pair = figures.slice(index, index + 2);
    const heights = pair.map((figure) => {
      const placeholder = figure.placeholder ? page.measure(figure.placeholder, { size: 8, bold: true }, columnWidth) + 2 : 0;
      return (
        page.measure(figure.label, { size: 9 }, columnWidth) +
        page.measure(figure.value, { size: 14, bold: true }, columnWidth) +
        placeholder +
        6
      );
    });
    const rowHeight = Math.max(...heights);
    page.ensureSpace(rowHeight);
    pair.forEach((figure, column) => {
      const x = page.left + column * (columnWidth + 16);
      let y = page.y;
      page.apply({ size: 9, colour: MUTED });
      page.doc.text(printable(figure.label), x, y, { width: columnWidth });
      y += page.measure(figure.label, { size: 9 }, columnWidth);
      page.apply({ size: 14, bold: true });
      page.doc.text(figure.value, x, y, { width: columnWidth });
      y += page.measure(figure.value, { size: 14, bold: true }, columnWidth);
      if (figure.placeholder) {
        page.apply({ size: 8, bold: true, colour: WARNING_INK });
        page.doc.text(figure.placeholder, x, y, { width: columnWidth });
      }
    });
    page.y += rowHeight;
  }
  page.paragraph(
    `Net energy from batteries and lines a year, after regeneration: ${formatBoardNumber(year.netKWh)} kWh; ${formatBoardNumber(year.km)} km driven.`,
    { size: 9 },
  );
  page.heading('How the year is counted', 10, { gapBefore: 0 });
  page.paragraph(annualBasisInBrief(summary.annual, summary.settings.currency), { size: 8.5 }, { gapAfter: 0 });

  routeChart(page, summary);

  page.heading('Descent safety', 12, { gapBefore: 2 });
  const counts = boardSafetyCounts(summary);
  const open = summary.openSafetyItems;
  page.paragraph(
    `Open items, waiting for a safety officer: ${counts.open} (critical ${open.critical}, high ${open.high}, elevated ${open.elevated}).`,
    { size: 10 },
  );
  page.paragraph(
    counts.accepted > 0
      ? `High or critical risks accepted: ${counts.accepted} (${counts.acceptedText}). Not open any more, but still in service at that risk.`
      : 'High or critical risks accepted: none.',
    { size: 10, bold: counts.accepted > 0, colour: counts.accepted > 0 ? WARNING_INK : INK },
  );
  if (summary.steepestDescents.length > 0) {
    page.table(
      [
        { header: 'Steepest descents in service', weight: 2.6 },
        { header: 'Risk', weight: 0.8 },
        { header: 'Direction and stretch', weight: 1.6 },
        { header: 'Drop', weight: 0.7, align: 'right' },
        { header: 'Mean grade', weight: 0.9, align: 'right' },
      ],
      summary.steepestDescents.map((descent) => [
        descent.routeName,
        RISK_LABELS[descent.risk],
        `${DIRECTION_LABELS[descent.direction]}, ${formatStretch(descent.startM, descent.endM, 'metric')}`,
        formatQuantity('elevation', descent.dropM, 'metric'),
        `${formatQuantity('grade', Math.abs(descent.meanGradePercent), 'metric')} down`,
      ]),
      { size: 8 },
    );
  }

  page.heading('Factors and sources', 10, { gapBefore: 0 });
  const { settings } = summary;
  if (settings.isPlaceholder) {
    page.paragraph(
      'The tariff and the grid emission factor are placeholders, not real figures: the money and CO2 figures above are illustrations only.',
      {
        size: 8.5,
        bold: true,
        colour: WARNING_INK,
      },
    );
  }
  page.paragraph(
    `Tariff ${formatTariff(settings.energyTariffPerKWh, settings.currency)}. Source: ${settings.tariffSource}`,
    { size: 7.5, colour: MUTED },
    { gapAfter: 2 },
  );
  page.paragraph(`Grid factor ${settings.gridEmissionFactorKgPerKWh} kg CO2 per kWh. Source: ${settings.emissionFactorSource}`, {
    size: 7.5,
    colour: MUTED,
  });
  page.cautionList(ADVICE_CAUTIONS_TITLE, ADVICE_CAUTIONS, { size: 7 });

  return page.end();
}

/** Horizontal bars per route: regeneration and friction-brake energy per year, one scale. */
function routeChart(page: PdfLayout, summary: BoardSummary): void {
  const { doc } = page;
  page.heading('Energy per route and year (kWh)');
  const routes = summary.routes.slice(0, MAX_CHART_ROUTES);
  if (routes.length === 0) {
    page.paragraph('No scenario is marked in service yet.', { size: 10, colour: MUTED });
    return;
  }
  const labelWidth = 180;
  const valueWidth = 50;
  const barLeft = page.left + labelWidth;
  const barSpace = page.width - labelWidth - valueWidth;
  const rowHeight = 20;
  const largest = Math.max(1, ...routes.flatMap((route) => [route.annualRegenKWh, route.annualFrictionBrakeKWh]));

  page.ensureSpace(16 + rowHeight * Math.min(routes.length, 4));
  page.apply({ size: 8 });
  doc.rect(barLeft, page.y, 9, 9).fill(REGEN_COLOUR);
  page.apply({ size: 8 });
  doc.text('regeneration', barLeft + 13, page.y + 1, { width: 80, lineBreak: false });
  doc.rect(barLeft + 100, page.y, 9, 9).fill(FRICTION_COLOUR);
  page.apply({ size: 8 });
  doc.text('friction brakes', barLeft + 113, page.y + 1, { width: 100, lineBreak: false });
  page.y += 16;

  for (const route of routes) {
    page.ensureSpace(rowHeight);
    const y = page.y;
    // A route name wraps to two lines beside its bars; a longer one is shortened, whole in the table of the web summary.
    page.apply({ size: 7.5 });
    doc.text(route.routeName, page.left, y + (page.measure(route.routeName, { size: 7.5 }, labelWidth - 8) > 12 ? 0 : 5), {
      width: labelWidth - 8,
      height: 20,
      ellipsis: true,
    });
    const regenW = (route.annualRegenKWh / largest) * barSpace;
    const frictionW = (route.annualFrictionBrakeKWh / largest) * barSpace;
    doc.rect(barLeft, y, Math.max(regenW, 0.5), 9).fill(REGEN_COLOUR);
    doc.rect(barLeft, y + 10, Math.max(frictionW, 0.5), 9).fill(FRICTION_COLOUR);
    page.apply({ size: 7, colour: MUTED });
    doc.text(formatBoardNumber(route.annualRegenKWh), barLeft + regenW + 4, y + 1, { width: valueWidth - 4, lineBreak: false });
    doc.text(formatBoardNumber(route.annualFrictionBrakeKWh), barLeft + frictionW + 4, y + 11, { width: valueWidth - 4, lineBreak: false });
    doc
      .moveTo(barLeft, y - 2)
      .lineTo(barLeft, y + rowHeight - 2)
      .lineWidth(0.5)
      .strokeColor(MUTED)
      .stroke();
    page.y += rowHeight;
  }
  if (summary.routes.length > routes.length) {
    page.paragraph(`… and ${summary.routes.length - routes.length} more routes (see the web summary).`, { size: 8, colour: MUTED });
  }
  page.y += 4;
}
