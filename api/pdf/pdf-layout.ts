/**
 * A4 pages laid out inside their margins, for both PDFs (the scenario report and the board
 * summary). Every block is measured in the font it is drawn in before it is placed; a block that
 * does not fit on the rest of the page starts a new page (a table repeats its header there); every
 * text is wrapped to the width it is given and drawn at an explicit x, never at wherever the last
 * text left PDFKit's cursor. The font is Noto Sans, the web app's own, embedded from the npm
 * package (nothing is fetched), so minus signs, en dashes and curly quotes print as they should.
 */
import { createRequire } from 'node:module';
import PDFDocument from 'pdfkit';

/** A4 in PDF points (1/72 in): 210 × 297 mm (ISO 216). */
export const A4_WIDTH_PT = 595.28;
export const A4_HEIGHT_PT = 841.89;
/** Margin on every side, pt (20 mm: common practice for a printed report). */
export const MARGIN_PT = 56.69;

export const INK = '#1d2730';
export const MUTED = '#5b6770';
const RULE = '#c9d1d6';

const require = createRequire(import.meta.url);
const FONT_FILES = {
  regular: require.resolve('@fontsource/noto-sans/files/noto-sans-latin-400-normal.woff'),
  bold: require.resolve('@fontsource/noto-sans/files/noto-sans-latin-700-normal.woff'),
};

/**
 * The embedded font subset (Latin) has no subscript digits: CO₂ is printed CO2. Everything else
 * Descentry prints (minus signs, en dashes, curly quotes, °, ·, …) is in it.
 */
export function printable(text: string): string {
  return text.replace(/₂/g, '2');
}

export interface TextStyle {
  size?: number;
  bold?: boolean;
  colour?: string;
}

export interface Column {
  header: string;
  /** Share of the table's width. */
  weight: number;
  align?: 'left' | 'right';
}

export class PdfLayout {
  readonly doc: PDFKit.PDFDocument;
  readonly left = MARGIN_PT;
  readonly width = A4_WIDTH_PT - 2 * MARGIN_PT;
  private readonly bottom = A4_HEIGHT_PT - MARGIN_PT;
  /** Where the next block starts, pt from the top of the page. */
  y = MARGIN_PT;
  private readonly finished: Promise<Buffer>;

  constructor(info: { Title: string }) {
    this.doc = new PDFDocument({ size: 'A4', margin: MARGIN_PT, autoFirstPage: true, info: { ...info, Creator: 'Descentry' } });
    this.doc.registerFont('regular', FONT_FILES.regular);
    this.doc.registerFont('bold', FONT_FILES.bold);
    const chunks: Buffer[] = [];
    this.doc.on('data', (chunk: Buffer) => chunks.push(chunk));
    this.finished = new Promise<Buffer>((resolve, reject) => {
      this.doc.on('end', () => resolve(Buffer.concat(chunks)));
      this.doc.on('error', reject);
    });
  }

  /** Ends the document; resolves with the whole file. */
  end(): Promise<Buffer> {
    this.doc.end();
    return this.finished;
  }

  /** Height the text takes when wrapped to `width`, in its style. */
  measure(text: string, style: TextStyle = {}, width = this.width): number {
    this.apply(style);
    return this.doc.heightOfString(printable(text), { width });
  }

  /** Starts a new page unless `height` more points fit on this one. */
  ensureSpace(height: number): void {
    if (this.y + height > this.bottom && this.y > MARGIN_PT) this.newPage();
  }

  newPage(): void {
    this.doc.addPage();
    this.y = MARGIN_PT;
  }

  /** A wrapped paragraph across the full width (or from `indent`), kept whole on one page. */
  paragraph(text: string, style: TextStyle = {}, { indent = 0, gapAfter = 4 } = {}): void {
    const width = this.width - indent;
    const height = this.measure(text, style, width);
    this.ensureSpace(height);
    this.apply(style);
    this.doc.text(printable(text), this.left + indent, this.y, { width });
    this.y += height + gapAfter;
  }

  heading(text: string, size = 12, { gapBefore = 6 } = {}): void {
    // Keep a heading with at least a few lines of what follows it.
    this.ensureSpace(this.measure(text, { size, bold: true }) + 40);
    this.y += gapBefore;
    this.paragraph(text, { size, bold: true }, { gapAfter: 4 });
  }

  /** Label and value pairs in two columns; long values wrap inside their column. */
  keyValues(rows: readonly (readonly [string, string])[], { labelWidth = 150, size = 9 } = {}): void {
    const valueWidth = this.width - labelWidth - 8;
    for (const [label, value] of rows) {
      const height = Math.max(this.measure(label, { size, bold: true }, labelWidth), this.measure(value, { size }, valueWidth));
      this.ensureSpace(height);
      this.apply({ size, bold: true });
      this.doc.text(printable(label), this.left, this.y, { width: labelWidth });
      this.apply({ size });
      this.doc.text(printable(value), this.left + labelWidth + 8, this.y, { width: valueWidth });
      this.y += height + 3;
    }
  }

  /**
   * A table with wrapped cells. Column widths are shares of the full width; the header is
   * repeated on every page the table reaches. `rowColour` colours a whole row's text.
   */
  table(
    columns: readonly Column[],
    rows: readonly (readonly string[])[],
    { size = 8, rowColour }: { size?: number; rowColour?: (row: number) => string | undefined } = {},
  ): void {
    const total = columns.reduce((sum, column) => sum + column.weight, 0);
    const widths = columns.map((column) => (column.weight / total) * this.width);
    const xs = widths.map((_, index) => this.left + widths.slice(0, index).reduce((sum, width) => sum + width, 0));
    const padding = 3;
    const rowHeight = (cells: readonly string[], bold: boolean) =>
      Math.max(...cells.map((cell, index) => this.measure(cell, { size, bold }, widths[index]! - 2 * padding))) + 2 * padding;
    const drawRow = (cells: readonly string[], bold: boolean, colour: string) => {
      const height = rowHeight(cells, bold);
      cells.forEach((cell, index) => {
        this.apply({ size, bold, colour });
        this.doc.text(printable(cell), xs[index]! + padding, this.y + padding, {
          width: widths[index]! - 2 * padding,
          align: columns[index]!.align ?? 'left',
        });
      });
      this.y += height;
      this.doc
        .save()
        .moveTo(this.left, this.y)
        .lineTo(this.left + this.width, this.y)
        .lineWidth(0.5)
        .strokeColor(RULE)
        .stroke()
        .restore();
    };
    const header = columns.map((column) => column.header);
    const headerHeight = rowHeight(header, true);
    this.ensureSpace(headerHeight + (rows[0] ? rowHeight(rows[0], false) : 0));
    drawRow(header, true, INK);
    rows.forEach((row, index) => {
      const height = rowHeight(row, false);
      if (this.y + height > this.bottom) {
        this.newPage();
        drawRow(header, true, INK);
      }
      drawRow(row, false, rowColour?.(index) ?? INK);
    });
    this.y += 6;
  }

  /** A boxed warning across the full width, kept whole on one page. */
  cautionBox(text: string, { size = 9 } = {}): void {
    const padding = 8;
    const textHeight = this.measure(text, { size, bold: true }, this.width - 2 * padding);
    const height = textHeight + 2 * padding;
    this.ensureSpace(height);
    this.doc.save().rect(this.left, this.y, this.width, height).lineWidth(1).fillAndStroke('#fff4e5', '#c2570c').restore();
    this.apply({ size, bold: true, colour: INK });
    this.doc.text(printable(text), this.left + padding, this.y + padding, { width: this.width - 2 * padding });
    this.y += height + 8;
  }

  /**
   * A caution box with a bold title and one bulleted line per caution (the advice cautions of
   * shared/presentation), kept whole on one page.
   */
  cautionList(title: string, cautions: readonly string[], { size = 8.5 } = {}): void {
    const padding = 8;
    const bulletIndent = 9;
    const innerWidth = this.width - 2 * padding;
    const titleHeight = this.measure(title, { size, bold: true }, innerWidth);
    const itemHeights = cautions.map((caution) => this.measure(caution, { size }, innerWidth - bulletIndent));
    const height = 2 * padding + titleHeight + itemHeights.reduce((sum, itemHeight) => sum + itemHeight + 2, 0);
    this.ensureSpace(height);
    this.doc.save().rect(this.left, this.y, this.width, height).lineWidth(1).fillAndStroke('#fff4e5', '#c2570c').restore();
    let y = this.y + padding;
    this.apply({ size, bold: true, colour: INK });
    this.doc.text(printable(title), this.left + padding, y, { width: innerWidth });
    y += titleHeight + 2;
    cautions.forEach((caution, index) => {
      this.apply({ size, colour: INK });
      this.doc.text('\u2022', this.left + padding, y, { width: bulletIndent });
      this.doc.text(printable(caution), this.left + padding + bulletIndent, y, { width: innerWidth - bulletIndent });
      y += itemHeights[index]! + 2;
    });
    this.y += height + 8;
  }

  /** Applies a text style to the document. */
  apply({ size = 10, bold = false, colour = INK }: TextStyle): void {
    this.doc
      .font(bold ? 'bold' : 'regular')
      .fontSize(size)
      .fillColor(colour);
  }
}
