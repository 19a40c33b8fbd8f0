// Worker thread (piscina) that decodes windows of terrain GeoTIFFs off the API's event loop.
// Plain JavaScript on purpose: it loads the same way under tsx, vitest and the bundled server.
//
// Task: { path, window: [x0, y0, x1, y1], nodata, verticalScaleToM, wide }
// Result: Float32Array (or Float64Array when `wide`) of (x1−x0)·(y1−y0) elevations in metres,
// row-major, with NaN wherever the file holds nodata (or NaN).
import Piscina from 'piscina';
import { fromFile } from 'geotiff';

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
  entry = fromFile(path).then(async (tiff) => ({ tiff, image: await tiff.getImage(0) }));
  openImages.set(path, entry);
  if (openImages.size > MAX_OPEN_FILES) {
    const [oldestPath, oldest] = openImages.entries().next().value;
    openImages.delete(oldestPath);
    oldest.then(({ tiff }) => tiff.close?.()).catch(() => undefined);
  }
  try {
    return await entry;
  } catch (error) {
    openImages.delete(path);
    throw error;
  }
}

export default async function decodeWindow({ path, window, nodata, verticalScaleToM, wide }) {
  const { image } = await imageFor(path);
  const [raster] = await image.readRasters({ window, samples: [0] });
  const out = wide ? new Float64Array(raster.length) : new Float32Array(raster.length);
  const hasNodata = nodata !== null && nodata !== undefined;
  for (let i = 0; i < raster.length; i++) {
    const value = raster[i];
    out[i] = (hasNodata && value === nodata) || value !== value ? NaN : value * verticalScaleToM;
  }
  return Piscina.move(out);
}

/** Drops cached file handles (after a model is deleted and its file removed). */
export function forget({ path }) {
  openImages.delete(path);
  return true;
}
