import { spawn } from 'node:child_process';
import { open } from 'node:fs/promises';
import { gunzipSync, constants as zlibConstants } from 'node:zlib';

/**
 * How an uploaded OpenStreetMap extract is encoded, found from its first bytes (never from its
 * name): the PBF format, OSM XML, or OSM XML compressed with bzip2 or gzip (the forms extracts
 * are published in).
 */
export type OsmFileFormat = 'pbf' | 'xml' | 'xml.bz2' | 'xml.gz';

/** What the first bytes of a file say it is; `null` when it is not an OpenStreetMap extract. */
export async function detectOsmFormat(path: string): Promise<OsmFileFormat | null> {
  const head = await readHead(path, 64 * 1024);
  if (isPbf(head)) return 'pbf';
  if (isOsmXml(head)) return 'xml';
  if (head[0] === 0x1f && head[1] === 0x8b) {
    // A partial gzip stream: decompress what is there (sync flush) and look at the XML inside.
    try {
      return isOsmXml(gunzipSync(head, { finishFlush: zlibConstants.Z_SYNC_FLUSH })) ? 'xml.gz' : null;
    } catch {
      // Expected for a damaged or non-gzip file that happens to start with the magic bytes.
      return null;
    }
  }
  if (head.subarray(0, 3).toString('latin1') === 'BZh') {
    return isOsmXml(await bunzipHead(path, 4096)) ? 'xml.bz2' : null;
  }
  return null;
}

/**
 * An OSM PBF file starts with a 4-byte big-endian length and a BlobHeader whose first field
 * (tag 0x0A, a string) is "OSMHeader" (OpenStreetMap wiki, "PBF Format").
 */
function isPbf(head: Buffer): boolean {
  if (head.length < 16) return false;
  const headerLength = head.readUInt32BE(0);
  return (
    headerLength > 0 &&
    headerLength < 64 * 1024 &&
    head[4] === 0x0a &&
    head[5] === 9 &&
    head.subarray(6, 15).toString('latin1') === 'OSMHeader'
  );
}

/** OSM XML: an `<osm>` root element (not `<osmChange>`, a change file) near the start. */
function isOsmXml(head: Buffer): boolean {
  const text = head
    .subarray(0, 4096)
    .toString('utf8')
    .replace(/^\uFEFF/, '');
  return /^\s*(<\?xml[^>]*\?>\s*)?(<!--[\s\S]*?-->\s*)*<osm[\s>]/.test(text);
}

async function readHead(path: string, bytes: number): Promise<Buffer> {
  const file = await open(path, 'r');
  try {
    const buffer = Buffer.alloc(bytes);
    const { bytesRead } = await file.read(buffer, 0, bytes, 0);
    return buffer.subarray(0, bytesRead);
  } finally {
    await file.close();
  }
}

/** The first `bytes` of a bzip2 file's content, from Debian's bzip2 (stopped as soon as it has them). */
function bunzipHead(path: string, bytes: number): Promise<Buffer> {
  return new Promise((resolve) => {
    const child = spawn('bzip2', ['-dc', path], { stdio: ['ignore', 'pipe', 'ignore'] });
    const chunks: Buffer[] = [];
    let length = 0;
    const finish = () => resolve(Buffer.concat(chunks).subarray(0, bytes));
    child.stdout.on('data', (chunk: Buffer) => {
      chunks.push(chunk);
      length += chunk.length;
      if (length >= bytes) child.kill('SIGTERM');
    });
    child.on('close', finish);
    child.on('error', () => resolve(Buffer.alloc(0)));
  });
}
