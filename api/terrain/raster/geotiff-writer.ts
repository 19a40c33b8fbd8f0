import { deflateSync } from 'node:zlib';

/** A north-up Float32 grid to write as a GeoTIFF. */
export interface GeoTiffGrid {
  widthPx: number;
  heightPx: number;
  /** Row-major elevations, north row first; NaN where there is no data. */
  values: Float32Array;
  /** EPSG code of a projected CRS in metres (e.g. 32632, UTM zone 32N). */
  epsg: number;
  /** Upper-left corner of the upper-left pixel (pixel-is-area). */
  originX: number;
  originY: number;
  pixelSizeM: number;
  nodata: number;
}

const TILE_PX = 256;

// TIFF field types (TIFF 6.0, §2).
const SHORT = 3;
const LONG = 4;
const ASCII = 2;
const DOUBLE = 12;

interface Entry {
  tag: number;
  type: number;
  values: number[] | string;
}

/**
 * Writes a tiled (256 × 256), DEFLATE-compressed Float32 GeoTIFF in pure Node, so the demo
 * terrain needs no GDAL at start-up. Little-endian classic TIFF (TIFF 6.0) with the GeoTIFF 1.1
 * keys for a projected EPSG CRS, pixel-is-area, metres, and a GDAL_NODATA tag.
 */
export function writeFloat32GeoTiff(grid: GeoTiffGrid): Buffer {
  const { widthPx, heightPx, values } = grid;
  const across = Math.ceil(widthPx / TILE_PX);
  const down = Math.ceil(heightPx / TILE_PX);
  const tiles: Buffer[] = [];
  const tile = new Float32Array(TILE_PX * TILE_PX);
  for (let ty = 0; ty < down; ty++) {
    for (let tx = 0; tx < across; tx++) {
      tile.fill(grid.nodata);
      for (let r = 0; r < TILE_PX; r++) {
        const row = ty * TILE_PX + r;
        if (row >= heightPx) break;
        for (let c = 0; c < TILE_PX; c++) {
          const col = tx * TILE_PX + c;
          if (col >= widthPx) break;
          const value = values[row * widthPx + col]!;
          tile[r * TILE_PX + c] = value === value ? value : grid.nodata;
        }
      }
      // TIFF compression 8 is zlib-wrapped DEFLATE (Adobe's TIFF DEFLATE specification).
      tiles.push(deflateSync(Buffer.from(tile.buffer.slice(0)), { level: 6 }));
    }
  }

  const tileOffsets: number[] = [];
  let offset = 8;
  for (const data of tiles) {
    tileOffsets.push(offset);
    offset += data.length + (data.length % 2);
  }
  const ifdOffset = offset;

  const geoKeys = [
    [1024, 0, 1, 1], // GTModelTypeGeoKey: projected
    [1025, 0, 1, 1], // GTRasterTypeGeoKey: pixel is area
    [3072, 0, 1, grid.epsg], // ProjectedCSTypeGeoKey
    [3076, 0, 1, 9001], // ProjLinearUnitsGeoKey: metre
    [4099, 0, 1, 9001], // VerticalUnitsGeoKey: metre
  ];
  const entries: Entry[] = [
    { tag: 256, type: LONG, values: [widthPx] },
    { tag: 257, type: LONG, values: [heightPx] },
    { tag: 258, type: SHORT, values: [32] },
    { tag: 259, type: SHORT, values: [8] },
    { tag: 262, type: SHORT, values: [1] },
    { tag: 277, type: SHORT, values: [1] },
    { tag: 284, type: SHORT, values: [1] },
    { tag: 322, type: SHORT, values: [TILE_PX] },
    { tag: 323, type: SHORT, values: [TILE_PX] },
    { tag: 324, type: LONG, values: tileOffsets },
    { tag: 325, type: LONG, values: tiles.map((t) => t.length) },
    { tag: 339, type: SHORT, values: [3] },
    { tag: 33550, type: DOUBLE, values: [grid.pixelSizeM, grid.pixelSizeM, 0] },
    { tag: 33922, type: DOUBLE, values: [0, 0, 0, grid.originX, grid.originY, 0] },
    { tag: 34735, type: SHORT, values: [1, 1, 0, geoKeys.length, ...geoKeys.flat()] },
    { tag: 42113, type: ASCII, values: `${grid.nodata}\0` },
  ];

  const ifdSize = 2 + entries.length * 12 + 4;
  let extraOffset = ifdOffset + ifdSize;
  const extras: Buffer[] = [];
  const ifd = Buffer.alloc(ifdSize);
  ifd.writeUInt16LE(entries.length, 0);
  entries.forEach((entry, i) => {
    const payload = encode(entry);
    const count = typeof entry.values === 'string' ? entry.values.length : entry.values.length;
    const at = 2 + i * 12;
    ifd.writeUInt16LE(entry.tag, at);
    ifd.writeUInt16LE(entry.type, at + 2);
    ifd.writeUInt32LE(count, at + 4);
    if (payload.length <= 4) {
      payload.copy(ifd, at + 8);
    } else {
      ifd.writeUInt32LE(extraOffset, at + 8);
      const padded = payload.length % 2 ? Buffer.concat([payload, Buffer.alloc(1)]) : payload;
      extras.push(padded);
      extraOffset += padded.length;
    }
  });
  ifd.writeUInt32LE(0, ifdSize - 4);

  const header = Buffer.alloc(8);
  header.write('II', 0, 'latin1');
  header.writeUInt16LE(42, 2);
  header.writeUInt32LE(ifdOffset, 4);
  const parts: Buffer[] = [header];
  for (const data of tiles) {
    parts.push(data);
    if (data.length % 2) parts.push(Buffer.alloc(1));
  }
  parts.push(ifd, ...extras);
  return Buffer.concat(parts);
}

function encode(entry: Entry): Buffer {
  if (typeof entry.values === 'string') return Buffer.from(entry.values, 'latin1');
  const size = entry.type === DOUBLE ? 8 : entry.type === LONG ? 4 : 2;
  const buffer = Buffer.alloc(entry.values.length * size);
  entry.values.forEach((value, i) => {
    if (entry.type === DOUBLE) buffer.writeDoubleLE(value, i * 8);
    else if (entry.type === LONG) buffer.writeUInt32LE(value, i * 4);
    else buffer.writeUInt16LE(value, i * 2);
  });
  return buffer;
}
