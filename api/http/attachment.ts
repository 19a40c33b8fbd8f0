import type { Response } from 'express';

/** A safe attachment file name from a display name (ASCII slug, at most 80 characters). */
export function attachmentName(name: string, extension: string): string {
  const slug = name
    .normalize('NFKD')
    .replace(/[^\w\s-]/g, '')
    .trim()
    .replace(/\s+/g, '-')
    .toLowerCase()
    .slice(0, 80);
  return `${slug || 'export'}.${extension}`;
}

/** Answers `body` as a download named after `displayName` (routes, scenario exports, reports). */
export function sendAttachment(res: Response, displayName: string, extension: string, contentType: string, body: string | Buffer): void {
  res.attachment(attachmentName(displayName, extension)).type(contentType).send(body);
}
