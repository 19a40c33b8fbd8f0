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

/** Resolution: "20 m", "30.9 m", "0.50 m". */
export function formatResolution(resolutionM: number): string {
  if (resolutionM >= 10) return `${Math.abs(resolutionM - Math.round(resolutionM)) < 0.05 ? Math.round(resolutionM) : resolutionM.toFixed(1)} m`;
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
