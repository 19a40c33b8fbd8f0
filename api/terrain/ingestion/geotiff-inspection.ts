import { open, stat } from 'node:fs/promises';
import { fromFile, type GeoTIFFImage } from 'geotiff';
import type { Polygon, TerrainDataType } from '@shared/domain/terrain';
import { HttpError } from '../../http/http-error';
import { lookupEpsg, projectorFor, type CrsDefinition } from '../raster/crs-registry';
import { WGS84_EQUATORIAL_M_PER_DEGREE, WGS84_MERIDIAN_M_PER_DEGREE } from '../raster/terrain-grid';

/** What ingestion and sampling need to know about a GeoTIFF, read from its header alone. */
export interface TerrainHeader {
  widthPx: number;
  heightPx: number;
  blockWidthPx: number;
  blockHeightPx: number;
  isTiled: boolean;
  bandCount: number;
  dataType: TerrainDataType;
  /** Declared nodata, or null. A NaN nodata is reported as null: NaN is always treated as nodata. */
  nodata: number | null;
  pixelType: 'area' | 'point';
  /** Corner of the grid in CRS units (pixel-is-area convention). */
  originX: number;
  originY: number;
  pixelSizeX: number;
  pixelSizeY: number;
  resolutionM: number;
  crs: CrsDefinition;
  verticalUnit: string;
  verticalScaleToM: number;
  compression: number;
  hasOwnOverviews: boolean;
  footprint: Polygon;
}

export interface InspectionLimits {
  maxPixels: number;
  maxBlockBytes: number;
}

/** TIFF (42) and BigTIFF (43) signatures, little- and big-endian. */
const TIFF_SIGNATURES = ['49492a00', '4d4d002a', '49492b00', '4d4d002b'];

/** Sample format (TIFF tag 339) and bits → the types we accept. */
const DATA_TYPES: Record<string, TerrainDataType> = {
  '2/16': 'Int16',
  '2/32': 'Int32',
  '3/32': 'Float32',
  '3/64': 'Float64',
};
const SAMPLE_FORMAT_NAMES: Record<number, string> = { 1: 'UInt', 2: 'Int', 3: 'Float' };

/** EPSG unit-of-measure codes for VerticalUnitsGeoKey (EPSG dataset, units table). */
const VERTICAL_UNITS: Record<number, { name: string; toM: number }> = {
  9001: { name: 'metre', toM: 1 },
  9002: { name: 'foot', toM: 0.3048 },
  9003: { name: 'US survey foot', toM: 1200 / 3937 },
};

/** GeoKey value meaning "user-defined" (GeoTIFF 1.1, §7.1.4). */
const USER_DEFINED = 32767;
/** Vertices per footprint edge: enough that a projected grid's curved outline stays faithful. */
const FOOTPRINT_SEGMENTS_PER_EDGE = 8;

/**
 * Reads and checks a GeoTIFF's header without reading its pixels (geotiff.js `fromFile` fetches
 * only the byte ranges it needs), and decodes its first block to prove the compression works.
 * Throws an HttpError naming the problem: 415 not a TIFF, 400 unreadable / truncated / not
 * georeferenced, 422 a CRS, data type or unit we cannot use, 413 a grid or block beyond the
 * configured bounds (decompression bombs).
 */
export async function inspectGeoTiff(path: string, limits: InspectionLimits): Promise<TerrainHeader> {
  await assertTiffSignature(path);
  const { size: fileSizeBytes } = await stat(path);

  let image: GeoTIFFImage;
  let imageCount: number;
  try {
    // Expected failure: a truncated or corrupt header makes geotiff.js throw while parsing IFDs.
    const tiff = await fromFile(path);
    image = await tiff.getImage(0);
    imageCount = await tiff.getImageCount();
  } catch (error) {
    throw new HttpError(400, 'corrupt_tiff', `The TIFF header cannot be read; the file is truncated or corrupt (${reason(error)})`);
  }

  const widthPx = image.getWidth();
  const heightPx = image.getHeight();
  if (!(widthPx > 0 && heightPx > 0)) {
    throw new HttpError(400, 'corrupt_tiff', 'The TIFF declares an empty image (width or height 0)');
  }
  const pixels = widthPx * heightPx;
  if (pixels > limits.maxPixels) {
    throw new HttpError(
      413,
      'raster_too_large',
      `The grid is ${widthPx} × ${heightPx} = ${pixels} pixels; the limit is ${limits.maxPixels} pixels`,
    );
  }

  const directory = image.getFileDirectory();
  const sampleFormat = image.getSampleFormat(0) ?? 1;
  const bitsPerSample = image.getBitsPerSample(0);
  const dataType = DATA_TYPES[`${sampleFormat}/${bitsPerSample}`];
  if (!dataType) {
    const name = `${SAMPLE_FORMAT_NAMES[sampleFormat] ?? `format ${sampleFormat} `}${bitsPerSample}`;
    throw new HttpError(
      422,
      'unsupported_data_type',
      `Band 1 holds ${name} values; elevation models must be Int16, Int32, Float32 or Float64`,
    );
  }

  const bandCount = image.getSamplesPerPixel();
  const blockWidthPx = image.getTileWidth();
  const blockHeightPx = image.getTileHeight();
  const isTiled = image.isTiled;
  const planar = directory.getValue('PlanarConfiguration') ?? 1;
  const samplesPerBlock = planar === 1 ? bandCount : 1;
  const blockBytes = blockWidthPx * blockHeightPx * samplesPerBlock * (bitsPerSample / 8);
  if (blockBytes > limits.maxBlockBytes) {
    throw new HttpError(
      413,
      'raster_too_large',
      `One ${isTiled ? 'tile' : 'strip'} of this file decodes to ${blockBytes} bytes; the limit is ${limits.maxBlockBytes} bytes`,
    );
  }
  await assertBlocksInsideFile(image, fileSizeBytes);

  const geo = readGeoreferencing(image);
  const crs = readCrs(image);
  const vertical = readVerticalUnit(image);

  // geotiff.js reports a pixel-is-point tiepoint as is; GDAL (and we) shift the grid corner by
  // half a pixel so that pixel centres stay where the file says they are.
  const pixelType = image.pixelIsArea() ? 'area' : 'point';
  const originX = pixelType === 'point' ? geo.originX - geo.pixelSizeX / 2 : geo.originX;
  const originY = pixelType === 'point' ? geo.originY - geo.pixelSizeY / 2 : geo.originY;

  const projector = projectorFor(crs.proj4Definition);
  const footprint = footprintOf({ ...geo, originX, originY, widthPx, heightPx }, (xy) => projector.inverse(xy));
  if (!footprint.coordinates[0]!.every(([lon, lat]) => Number.isFinite(lon) && Number.isFinite(lat))) {
    throw new HttpError(422, 'unsupported_crs', `The grid's corners cannot be transformed from ${crs.crs} to WGS 84`);
  }
  const resolutionM = resolutionInMetres(crs, geo.pixelSizeX, geo.pixelSizeY, footprint);

  await assertFirstBlockDecodes(image);

  return {
    widthPx,
    heightPx,
    blockWidthPx,
    blockHeightPx,
    isTiled,
    bandCount,
    dataType,
    nodata: readNodata(image),
    pixelType,
    originX,
    originY,
    pixelSizeX: geo.pixelSizeX,
    pixelSizeY: geo.pixelSizeY,
    resolutionM,
    crs,
    verticalUnit: vertical.name,
    verticalScaleToM: vertical.toM,
    compression: directory.getValue('Compression') ?? 1,
    hasOwnOverviews: imageCount > 1,
    footprint,
  };
}

async function assertTiffSignature(path: string): Promise<void> {
  const handle = await open(path, 'r');
  try {
    const { bytesRead, buffer } = await handle.read(Buffer.alloc(4), 0, 4, 0);
    if (bytesRead < 4 || !TIFF_SIGNATURES.includes(buffer.toString('hex'))) {
      throw new HttpError(
        415,
        'not_a_tiff',
        'The file is not a TIFF: it does not start with a TIFF signature (upload a GeoTIFF elevation model)',
      );
    }
  } finally {
    await handle.close();
  }
}

/** Every tile or strip must end inside the file; a cut-off upload fails here, not mid-ingestion. */
async function assertBlocksInsideFile(image: GeoTIFFImage, fileSizeBytes: number): Promise<void> {
  const directory = image.getFileDirectory();
  const offsetsTag = image.isTiled ? 'TileOffsets' : 'StripOffsets';
  const countsTag = image.isTiled ? 'TileByteCounts' : 'StripByteCounts';
  let offsets: ArrayLike<number> | undefined;
  let counts: ArrayLike<number> | undefined;
  try {
    // Expected failure: the offset arrays themselves lie beyond the end of a truncated file.
    offsets = (await directory.loadValue(offsetsTag)) as ArrayLike<number> | undefined;
    counts = (await directory.loadValue(countsTag)) as ArrayLike<number> | undefined;
  } catch (error) {
    throw new HttpError(400, 'corrupt_tiff', `The TIFF's block table cannot be read; the file is truncated or corrupt (${reason(error)})`);
  }
  if (!offsets || !counts || offsets.length !== counts.length) {
    throw new HttpError(400, 'corrupt_tiff', `The TIFF has no valid ${offsetsTag}/${countsTag} table`);
  }
  let endByte = 0;
  for (let i = 0; i < offsets.length; i++) {
    const end = Number(offsets[i]) + Number(counts[i]);
    if (end > endByte) endByte = end;
  }
  if (endByte > fileSizeBytes) {
    throw new HttpError(
      400,
      'truncated_tiff',
      `The file is truncated: its pixel data runs to byte ${endByte} but the file has ${fileSizeBytes} bytes`,
    );
  }
}

interface Georeferencing {
  originX: number;
  originY: number;
  pixelSizeX: number;
  pixelSizeY: number;
}

function readGeoreferencing(image: GeoTIFFImage): Georeferencing {
  const directory = image.getFileDirectory();
  const transformation = directory.getValue('ModelTransformation') as number[] | undefined;
  if (transformation && (transformation[1] !== 0 || transformation[4] !== 0)) {
    throw new HttpError(422, 'rotated_grid', 'The grid is rotated or sheared (ModelTransformation); warp it to a north-up grid first');
  }
  let origin: number[];
  let resolution: number[];
  try {
    // Expected failure: geotiff.js throws when neither tiepoint + pixel scale nor a
    // transformation matrix is present.
    origin = image.getOrigin();
    resolution = image.getResolution();
  } catch {
    throw new HttpError(
      400,
      'no_georeferencing',
      'The file has no georeferencing: it lacks ModelTiepoint + ModelPixelScale (or ModelTransformation), so its position is unknown',
    );
  }
  const [originX, originY] = origin;
  const [pixelSizeX, pixelSizeY] = resolution;
  if (![originX, originY, pixelSizeX, pixelSizeY].every((v) => Number.isFinite(v)) || !pixelSizeX || !pixelSizeY) {
    throw new HttpError(400, 'no_georeferencing', 'The file has no usable georeferencing (zero or missing pixel size)');
  }
  return { originX: originX!, originY: originY!, pixelSizeX: pixelSizeX!, pixelSizeY: pixelSizeY! };
}

function readCrs(image: GeoTIFFImage): CrsDefinition {
  const keys = image.getGeoKeys() ?? {};
  const modelType = keys.GTModelTypeGeoKey as number | undefined;
  const projected = keys.ProjectedCSTypeGeoKey as number | undefined;
  const geographic = keys.GeographicTypeGeoKey as number | undefined;
  const code = modelType === 2 ? geographic : (projected ?? geographic);
  if (code === undefined) {
    throw new HttpError(
      400,
      'no_georeferencing',
      'The file has no georeferencing: it declares no coordinate reference system (no EPSG code in its GeoKeys)',
    );
  }
  if (code === USER_DEFINED) {
    throw new HttpError(
      422,
      'unsupported_crs',
      'The file uses a user-defined coordinate reference system without an EPSG code; reproject it to an EPSG CRS (e.g. a UTM zone)',
    );
  }
  const definition = lookupEpsg(code);
  if (!definition) {
    throw new HttpError(422, 'unsupported_crs', `EPSG:${code} is not a coordinate reference system we can transform`);
  }
  try {
    // Expected failure: proj4 rejects a definition it cannot parse.
    projectorFor(definition.proj4Definition).inverse([0, 0]);
  } catch {
    throw new HttpError(422, 'unsupported_crs', `EPSG:${code} (${definition.name}) cannot be transformed to WGS 84`);
  }
  return definition;
}

function readVerticalUnit(image: GeoTIFFImage): { name: string; toM: number } {
  const code = (image.getGeoKeys() ?? {}).VerticalUnitsGeoKey as number | undefined;
  if (code === undefined) return VERTICAL_UNITS[9001]!;
  const unit = VERTICAL_UNITS[code];
  if (!unit) {
    throw new HttpError(422, 'unsupported_vertical_unit', `The vertical unit EPSG:${code} is not supported; use metres or feet`);
  }
  return unit;
}

/** GDAL_NODATA (TIFF tag 42113) is ASCII text; "nan" is a valid value. */
function readNodata(image: GeoTIFFImage): number | null {
  const directory = image.getFileDirectory();
  if (!directory.hasTag('GDAL_NODATA')) return null;
  const text = String(directory.getValue('GDAL_NODATA') ?? '')
    .replace(/\0/g, '')
    .trim();
  if (!text) return null;
  const value = Number(text);
  return Number.isFinite(value) ? value : null;
}

async function assertFirstBlockDecodes(image: GeoTIFFImage): Promise<void> {
  try {
    // Expected failure: an unsupported compression scheme or corrupt compressed data.
    await image.readRasters({ window: [0, 0, 1, 1], samples: [0] });
  } catch (error) {
    const compression = image.getFileDirectory().getValue('Compression');
    throw new HttpError(400, 'corrupt_tiff', `The pixel data cannot be decoded (compression ${compression}): ${reason(error)}`);
  }
}

/** Outline of the grid in WGS 84, each edge densified so projected grids keep their shape. */
export function footprintOf(
  grid: Georeferencing & { widthPx: number; heightPx: number },
  toWgs84: (xy: [number, number]) => [number, number],
): Polygon {
  const { originX, originY, pixelSizeX, pixelSizeY, widthPx, heightPx } = grid;
  const corners: Array<[number, number]> = [
    [0, 0],
    [0, heightPx],
    [widthPx, heightPx],
    [widthPx, 0],
  ];
  const ring: Array<[number, number]> = [];
  for (let edge = 0; edge < 4; edge++) {
    const [c0, r0] = corners[edge]!;
    const [c1, r1] = corners[(edge + 1) % 4]!;
    for (let step = 0; step < FOOTPRINT_SEGMENTS_PER_EDGE; step++) {
      const t = step / FOOTPRINT_SEGMENTS_PER_EDGE;
      const col = c0 + (c1 - c0) * t;
      const row = r0 + (r1 - r0) * t;
      ring.push(toWgs84([originX + col * pixelSizeX, originY + row * pixelSizeY]));
    }
  }
  ring.push(ring[0]!);
  // RFC 7946 wants exterior rings counter-clockwise; the corner order above (north-west, south-west,
  // south-east, north-east) is counter-clockwise for a north-up grid.
  return { type: 'Polygon', coordinates: [ring] };
}

function resolutionInMetres(crs: CrsDefinition, pixelSizeX: number, pixelSizeY: number, footprint: Polygon): number {
  if (!crs.isGeographic) {
    const toM = /\+units=us-ft\b/.test(crs.proj4Definition) ? 1200 / 3937 : /\+units=ft\b/.test(crs.proj4Definition) ? 0.3048 : 1;
    return Math.sqrt(Math.abs(pixelSizeX * pixelSizeY)) * toM;
  }
  const latitudes = footprint.coordinates[0]!.map(([, lat]) => lat);
  const centreLatRad = (((Math.min(...latitudes) + Math.max(...latitudes)) / 2) * Math.PI) / 180;
  const xM = Math.abs(pixelSizeX) * WGS84_EQUATORIAL_M_PER_DEGREE * Math.cos(centreLatRad);
  const yM = Math.abs(pixelSizeY) * WGS84_MERIDIAN_M_PER_DEGREE;
  return Math.sqrt(xM * yM);
}

function reason(error: unknown): string {
  return error instanceof Error ? error.message : String(error);
}
