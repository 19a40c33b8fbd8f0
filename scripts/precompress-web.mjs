// Writes a brotli (.br) and a gzip (.gz) copy beside every compressible file of the built web app
// (`node scripts/precompress-web.mjs [folder]`, run by `npm run build:web`), so the server hands
// out compressed bytes without compressing anything per request. index.html is left out: the
// server renders it per answer (it carries that answer's CSP nonce) and compresses it on the fly.
// A copy is kept only when it is smaller than the file itself.
import { readdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { extname, join, relative, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { brotliCompressSync, constants, gzipSync } from 'node:zlib';

/** Text formats worth compressing; fonts (woff2) and images (png) are compressed already. */
const COMPRESSIBLE = new Set(['.js', '.mjs', '.css', '.svg', '.json', '.txt', '.map', '.ttf', '.ico', '.webmanifest', '.xml', '.html']);
/** Below this a compressed copy saves less than the headers cost (the compression middleware's default threshold). */
const MIN_BYTES = 1024;

/** The brotli copy of `content` as the server hands it out: quality 11, text mode (paid once at build time). */
export function brotliForWeb(content) {
  return brotliCompressSync(content, {
    params: {
      [constants.BROTLI_PARAM_QUALITY]: constants.BROTLI_MAX_QUALITY,
      [constants.BROTLI_PARAM_MODE]: constants.BROTLI_MODE_TEXT,
      [constants.BROTLI_PARAM_SIZE_HINT]: content.length,
    },
  });
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  const root = resolve(process.argv[2] ?? 'dist/web/browser');
  let files = 0;
  let before = 0;
  let afterBrotli = 0;
  for (const path of walk(root)) {
    const name = relative(root, path);
    if (name === 'index.html' || !COMPRESSIBLE.has(extname(path))) continue;
    const content = readFileSync(path);
    if (content.length < MIN_BYTES) continue;
    const brotli = brotliForWeb(content);
    const gzip = gzipSync(content, { level: 9 });
    if (brotli.length < content.length) writeFileSync(`${path}.br`, brotli);
    if (gzip.length < content.length) writeFileSync(`${path}.gz`, gzip);
    files += 1;
    before += content.length;
    afterBrotli += Math.min(brotli.length, content.length);
  }
  console.log(`precompressed ${files} files in ${root}: ${kb(before)} → ${kb(afterBrotli)} with brotli`);
}

function* walk(folder) {
  for (const entry of readdirSync(folder)) {
    const path = join(folder, entry);
    if (statSync(path).isDirectory()) yield* walk(path);
    else if (!entry.endsWith('.br') && !entry.endsWith('.gz')) yield path;
  }
}

function kb(bytes) {
  return `${(bytes / 1024).toFixed(0)} kB`;
}
