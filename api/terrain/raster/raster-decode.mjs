// Decoding windows of terrain GeoTIFFs into elevations in metres, used by the decode worker
// threads (raster-decode-worker.mjs) and, for one block of a map tile while the workers are idle,
// by the API thread. Plain JavaScript on purpose: it loads the same way under tsx, vitest, the
// worker threads and the bundled server.
//
// decodeWindow({ path, window: [x0, y0, x1, y1], nodata, verticalScaleToM, wide, into? }):
// Float32Array (or Float64Array when `wide`) of (x1−x0)·(y1−y0) elevations in metres, row-major,
// with NaN wherever the file holds nodata (or NaN); written into the ArrayBuffer `into` when it is
// large enough. Each thread keeps its own few files open.
import { closeSync, openSync, readSync } from 'node:fs';
import { inflateSync } from 'node:zlib';
import { BaseDecoder, fromFile } from 'geotiff';

/** Open files stay open between tasks; a few suffice since requests cluster on few models. */
const MAX_OPEN_FILES = 8;
const openImages = new Map();

async function imageFor(path) {
  let entry = openImages.get(path);
  if (entry) {
    openImages.delete(path);
    openImages.set(path, entry);
    return entry;
  }
  entry = fromFile(path).then(async (tiff) => {
    const image = await tiff.getImage(0);
    return { tiff, image, direct: await directReader(image, path) };
  });
  openImages.set(path, entry);
  if (openImages.size > MAX_OPEN_FILES) {
    const [oldestPath, oldest] = openImages.entries().next().value;
    openImages.delete(oldestPath);
    oldest.then(closeImage).catch(() => undefined);
  }
  try {
    return await entry;
  } catch (error) {
    openImages.delete(path);
    throw error;
  }
}

export async function decodeWindow({ path, window, nodata, verticalScaleToM, wide, into }) {
  const { image, direct } = await imageFor(path);
  const length = (window[2] - window[0]) * (window[3] - window[1]);
  const Values = wide ? Float64Array : Float32Array;
  // A buffer handed over by the caller is filled and handed back: a long scan reuses one buffer
  // instead of leaving a new one per band for the garbage collector.
  const out = into && into.byteLength >= length * Values.BYTES_PER_ELEMENT ? new Values(into, 0, length) : new Values(length);
  const convert = { nodata: nodata ?? null, scale: verticalScaleToM };
  if (direct) await readDirect(image, direct, window, out, convert);
  else {
    const [raster] = await image.readRasters({ window, samples: [0] });
    convertInto(raster, 0, out, 0, raster.length, convert);
  }
  return out;
}

/**
 * Elevations in metres: nodata and NaN become NaN, the rest is scaled (feet → metres etc.). The
 * values are copied natively (converting the file's type), then nodata and the scale are applied
 * in place: `out` is one of two array types whatever the file holds, which keeps the loop fast.
 * (Every sample type converts exactly into `out`, so nodata compares the same after the copy.)
 */
function convertInto(source, from, out, to, count, { nodata, scale }) {
  out.set(source.subarray(from, from + count), to);
  const end = to + count;
  if (nodata !== null) {
    for (let k = to; k < end; k++) if (out[k] === nodata) out[k] = NaN;
  }
  if (scale !== 1) {
    for (let k = to; k < end; k++) out[k] *= scale;
  }
}

const HOST_IS_LITTLE_ENDIAN = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;

/**
 * Uncompressed and DEFLATE files of one sample per pixel in the host's byte order (what GDAL
 * writes for elevation grids) are read tile by tile straight into typed arrays, inflated by
 * Node's native zlib. Anything else goes through geotiff.js's general (slower) readRasters.
 */
async function directReader(image, path) {
  const directory = image.getFileDirectory();
  const compression = directory.getValue('Compression') ?? 1;
  if (compression !== 1 && compression !== 8 && compression !== 32946) return null;
  if (image.getSamplesPerPixel() !== 1 || image.littleEndian !== HOST_IS_LITTLE_ENDIAN) return null;
  const bits = image.getBitsPerSample(0);
  const format = image.getSampleFormat(0);
  if (![8, 16, 32, 64].includes(bits) || (format === 3 && bits < 32)) return null;
  const isTiled = !directory.hasTag('StripOffsets');
  const decoder = new NativeDecoder(compression, {
    tileWidth: image.getTileWidth(),
    tileHeight: image.getTileHeight(),
    planarConfiguration: directory.getValue('PlanarConfiguration') ?? 1,
    bitsPerSample: await directory.loadValue('BitsPerSample'),
    predictor: (await directory.loadValue('Predictor')) || 1,
  });
  const predictor = (await directory.loadValue('Predictor')) || 1;
  const planar = directory.getValue('PlanarConfiguration') ?? 1;
  // Without a predictor, a tile is just its inflated bytes: the offsets and byte counts are read
  // once and each tile is one positioned read and one inflate, off geotiff.js's per-tile path.
  let blocks = null;
  if (predictor === 1 && planar === 1) {
    const offsets = await directory.loadValue(isTiled ? 'TileOffsets' : 'StripOffsets');
    const byteCounts = await directory.loadValue(isTiled ? 'TileByteCounts' : 'StripByteCounts');
    blocks = { offsets, byteCounts, fd: openSync(path, 'r'), compression };
  }
  return { decoder, isTiled, blocks };
}

/** The samples of tile/strip (tx, ty) as a typed array of the file's sample type. */
function readBlock(image, blocks, tx, ty, tileWidth) {
  const index = ty * Math.ceil(image.getWidth() / tileWidth) + tx;
  const bytesPerSample = image.getBitsPerSample(0) / 8;
  const length = Number(blocks.byteCounts[index]);
  let bytes;
  if (length === 0) {
    bytes = new Uint8Array(image.getBlockHeight(ty) * tileWidth * bytesPerSample);
    const empty = image.getArrayForSample(0, bytes.buffer);
    empty.fill(image.getGDALNoData() || 0);
    return empty;
  }
  const raw = Buffer.allocUnsafeSlow(length);
  readSync(blocks.fd, raw, 0, length, Number(blocks.offsets[index]));
  // One output chunk the size of the block (and a little over, so zlib sees the stream end
  // without a second chunk): no joining of 16 KB pieces.
  const expected = image.getBlockHeight(ty) * tileWidth * bytesPerSample;
  bytes = blocks.compression === 1 ? raw : inflateSync(raw, { chunkSize: Math.max(64 * 1024, expected + 1024) });
  const buffer =
    bytes.byteOffset === 0 && bytes.byteLength === bytes.buffer.byteLength && bytes.byteOffset % bytesPerSample === 0
      ? bytes.buffer
      : bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength);
  return image.getArrayForSample(0, buffer);
}

function closeImage({ tiff, direct }) {
  if (direct?.blocks) closeSync(direct.blocks.fd);
  return tiff.close?.();
}

/** geotiff.js's decoder contract (it applies the predictor), inflating with zlib instead of pako. */
class NativeDecoder extends BaseDecoder {
  constructor(compression, parameters) {
    super(parameters);
    this.compression = compression;
  }

  decodeBlock(buffer) {
    if (this.compression === 1) return buffer;
    const inflated = inflateSync(new Uint8Array(buffer));
    return inflated.byteOffset === 0 && inflated.byteLength === inflated.buffer.byteLength
      ? inflated.buffer
      : inflated.buffer.slice(inflated.byteOffset, inflated.byteOffset + inflated.byteLength);
  }
}

async function readDirect(image, { decoder, blocks }, [x0, y0, x1, y1], out, convert) {
  const tileWidth = image.getTileWidth();
  const tileHeight = image.getTileHeight();
  const width = x1 - x0;
  for (let ty = Math.floor(y0 / tileHeight); ty * tileHeight < y1; ty++) {
    for (let tx = Math.floor(x0 / tileWidth); tx * tileWidth < x1; tx++) {
      const values = blocks
        ? readBlock(image, blocks, tx, ty, tileWidth)
        : image.getArrayForSample(0, (await image.getTileOrStrip(tx, ty, 0, decoder)).data);
      const tileX0 = tx * tileWidth;
      const tileY0 = ty * tileHeight;
      const c0 = Math.max(x0, tileX0);
      const c1 = Math.min(x1, tileX0 + tileWidth);
      const rows = Math.min(y1, tileY0 + image.getBlockHeight(ty));
      for (let r = Math.max(y0, tileY0); r < rows; r++) {
        convertInto(values, (r - tileY0) * tileWidth + (c0 - tileX0), out, (r - y0) * width + (c0 - x0), c1 - c0, convert);
      }
    }
  }
}

/** Drops cached file handles (after a model is deleted and its file removed). */
export function forgetFile(path) {
  const entry = openImages.get(path);
  openImages.delete(path);
  entry?.then(closeImage).catch(() => undefined);
  return true;
}
