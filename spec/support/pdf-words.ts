import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

/** One word of a rendered PDF page, with its box in points from the page's top-left corner. */
export interface PdfWord {
  page: number;
  text: string;
  xMin: number;
  yMin: number;
  xMax: number;
  yMax: number;
}

export interface PdfPages {
  pages: { width: number; height: number }[];
  words: PdfWord[];
  /** The words of each page joined with spaces, for reading checks. */
  text: string[];
}

/**
 * Renders a PDF with poppler's `pdftotext -bbox` (Debian's poppler-utils, installed by the test
 * command) and returns every word with its box: what a reader of the printed page gets, checked
 * independently of the PDF library that wrote it.
 */
export function readPdfWords(pdf: Buffer): PdfPages {
  const dir = mkdtempSync(join(tmpdir(), 'descentry-pdf-'));
  try {
    const file = join(dir, 'document.pdf');
    writeFileSync(file, pdf);
    const html = execFileSync('pdftotext', ['-bbox', file, '-'], { encoding: 'utf8' });
    const pages: PdfPages['pages'] = [];
    const words: PdfWord[] = [];
    const pageChunks = html.split('<page ').slice(1);
    pageChunks.forEach((chunk, page) => {
      const [, width, height] = /width="([\d.]+)" height="([\d.]+)"/.exec(chunk)!;
      pages.push({ width: Number(width), height: Number(height) });
      for (const match of chunk.matchAll(/<word xMin="([\d.-]+)" yMin="([\d.-]+)" xMax="([\d.-]+)" yMax="([\d.-]+)">([^<]*)<\/word>/g)) {
        words.push({
          page,
          xMin: Number(match[1]),
          yMin: Number(match[2]),
          xMax: Number(match[3]),
          yMax: Number(match[4]),
          text: decode(match[5]!),
        });
      }
    });
    const text = pages.map((_, page) =>
      words
        .filter((word) => word.page === page)
        .map((word) => word.text)
        .join(' '),
    );
    return { pages, words, text };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

/** Words whose box is not inside the page less `marginPt` on every side. */
export function wordsOutsideMargins(document: PdfPages, marginPt: number): PdfWord[] {
  // Half a point of slack: glyph boxes are rounded by the reader.
  const slack = 0.5;
  return document.words.filter((word) => {
    const page = document.pages[word.page]!;
    return (
      word.xMin < marginPt - slack ||
      word.yMin < marginPt - slack ||
      word.xMax > page.width - marginPt + slack ||
      word.yMax > page.height - marginPt + slack
    );
  });
}

/** Stored codes and machine formats a person should never read in a report. */
export const RAW_VALUE_PATTERNS: readonly RegExp[] = [
  /\boutbound\b/, // the stored codes are lower case; the labels are "Outbound", "Inbound"
  /\binbound\b/,
  /\bround-trip\b/,
  /\bfull-standing\b/,
  /\bbattery-bus-\w+|light-rail-vehicle|trolleybus-12m\b/,
  /\d{4}-\d\d-\d\dT\d\d:\d\d/, // ISO 8601 timestamps
  /\bnot-holdable\b|\bno-limit-needed\b/,
];

function decode(text: string): string {
  return text
    .replace(/&amp;/g, '&')
    .replace(/&lt;/g, '<')
    .replace(/&gt;/g, '>')
    .replace(/&quot;/g, '"')
    .replace(/&#39;|&apos;/g, "'");
}
