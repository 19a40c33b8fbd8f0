// Types of scripts/precompress-web.mjs for the TypeScript that imports it (scripts/page-weight-floor.ts).
export function brotliForWeb(content: Buffer): Buffer;
