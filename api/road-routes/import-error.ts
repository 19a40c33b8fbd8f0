import { BadRequestError } from '../http/http-error';

/** A 400 for a file that cannot be imported, naming the file, and the line and field when known. */
export class ImportError extends BadRequestError {
  constructor(where: { file: string; line?: number; field?: string }, problem: string) {
    const place = [where.file, where.line === undefined ? undefined : `line ${where.line}`, where.field].filter(Boolean).join(', ');
    super(`${place}: ${problem}`, { file: where.file, line: where.line, field: where.field }, 'invalid_file');
  }
}

/** 1-based line of a character offset in a text. */
export function lineAt(text: string, offset: number): number {
  let line = 1;
  for (let i = 0; i < Math.min(offset, text.length); i++) if (text.charCodeAt(i) === 10) line++;
  return line;
}
