import type { TerrainModel, TerrainStatus } from '@shared/domain/terrain';

/** Plain-English status labels for the catalogue. */
export const TERRAIN_STATUS_LABELS: Readonly<Record<TerrainStatus, string>> = {
  processing: 'Processing',
  ready: 'Ready',
  failed: 'Failed',
};

/** File sizes as people read them: "812 kB", "1.4 GB" (decimal units, like file managers). */
export function formatFileSize(bytes: number): string {
  if (bytes < 1000) return `${bytes} B`;
  const units = ['kB', 'MB', 'GB', 'TB'];
  let value = bytes / 1000;
  let unit = 0;
  while (value >= 1000 && unit < units.length - 1) {
    value /= 1000;
    unit++;
  }
  return `${value < 10 ? value.toFixed(1) : Math.round(value)} ${units[unit]}`;
}

/** "700 – 2 614 m", or an em dash while the range is unknown. */
export function formatElevationRange(model: Pick<TerrainModel, 'minElevationM' | 'maxElevationM'>): string {
  if (model.minElevationM === null || model.maxElevationM === null) return '—';
  return `${formatMetres(model.minElevationM)} – ${formatMetres(model.maxElevationM)} m`;
}

/**
 * A model's resolution in the grid's own unit and, where that is not metres, in metres at the
 * model's centre: "20 m"; "30″ (about 655 × 927 m at the centre)" for a 30 arc-second grid at 45°;
 * "10 ft (3.0 m)".
 */
export function formatModelResolution(model: Pick<TerrainModel, 'resolutionM' | 'pixelSize' | 'footprint'>): string {
  const { x, y, unit } = model.pixelSize;
  if (unit === 'metre') return formatResolution(model.resolutionM);
  if (unit !== 'degree') {
    const symbol = unit === 'foot' ? 'ft' : 'US ft';
    return `${formatNumberShort(x)}${x === y ? '' : ` × ${formatNumberShort(y)}`} ${symbol} (${formatResolution(model.resolutionM)})`;
  }
  const angle = (degrees: number) =>
    degrees < 1 / 60
      ? `${formatNumberShort(degrees * 3600)}″`
      : degrees < 1
        ? `${formatNumberShort(degrees * 60)}′`
        : `${formatNumberShort(degrees)}°`;
  const native = Math.abs(x - y) < 1e-12 ? angle(x) : `${angle(x)} × ${angle(y)}`;
  const latitudes = model.footprint?.coordinates[0]?.map(([, lat]) => lat) ?? [];
  if (latitudes.length === 0) return `${native} (about ${formatResolution(model.resolutionM)})`;
  const centreLatRad = (((Math.min(...latitudes) + Math.max(...latitudes)) / 2) * Math.PI) / 180;
  // Metres per degree on the WGS 84 ellipsoid near the centre latitude (common practice: 111 320 m
  // per degree of longitude at the equator times cos φ; 110 574–111 694 m per degree of latitude).
  const eastM = x * 111_320 * Math.cos(centreLatRad);
  const northM = y * (111_132.954 - 559.822 * Math.cos(2 * centreLatRad));
  return `${native} (about ${formatMetresShort(eastM)} × ${formatMetresShort(northM)} m at the centre)`;
}

function formatNumberShort(value: number): string {
  return Number.isInteger(Math.round(value * 1000) / 1000) ? String(Math.round(value)) : String(Number(value.toPrecision(3)));
}

function formatMetresShort(metres: number): string {
  return metres >= 10 ? groupThousands(Math.round(metres)) : metres.toFixed(1);
}

/** Resolution in metres: "20 m", "30.9 m", "0.50 m". */
export function formatResolution(resolutionM: number): string {
  if (resolutionM >= 10)
    return `${Math.abs(resolutionM - Math.round(resolutionM)) < 0.05 ? Math.round(resolutionM) : resolutionM.toFixed(1)} m`;
  return `${resolutionM.toPrecision(2)} m`;
}

/** "4 000 × 3 000 px" with thin-space thousands, as the rest of the interface writes numbers. */
export function formatPixelSize(model: Pick<TerrainModel, 'widthPx' | 'heightPx'>): string {
  return `${groupThousands(model.widthPx)} × ${groupThousands(model.heightPx)} px`;
}

/** Nodata share as a percentage with sensible precision. */
export function formatNodataShare(share: number | null): string {
  if (share === null) return '—';
  if (share === 0) return 'none';
  const percent = share * 100;
  return `${percent < 0.1 ? '< 0.1' : percent < 10 ? percent.toFixed(1) : Math.round(percent)} %`;
}

function formatMetres(value: number): string {
  return groupThousands(Math.round(value));
}

function groupThousands(value: number): string {
  return String(value).replace(/\B(?=(\d{3})+(?!\d))/g, '\u2009');
}
