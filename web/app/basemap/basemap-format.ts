import type { BasemapImportPhase, BasemapImportStatus } from '@shared/domain/basemap';

export const BASEMAP_STATUS_LABELS: Readonly<Record<BasemapImportStatus, string>> = {
  queued: 'Waiting',
  importing: 'Importing',
  ready: 'Ready',
  failed: 'Failed',
};

export const BASEMAP_PHASE_LABELS: Readonly<Record<BasemapImportPhase, string>> = {
  reading: 'Reading the file',
  indexing: 'Indexing',
  'road-graph': 'Building the road graph',
  generalising: 'Simplifying for small scales',
  'terrain-grades': 'Taking grades from the terrain',
  switching: 'Switching the map over',
};

/** Status chip tone shared with the other catalogues. */
export function statusTone(status: BasemapImportStatus): 'done' | 'pending' | 'failed' {
  return status === 'ready' ? 'done' : status === 'failed' ? 'failed' : 'pending';
}

export function formatMegabytes(bytes: number): string {
  const mb = bytes / 1024 ** 2;
  return mb >= 10 ? `${Math.round(mb)} MB` : `${mb.toFixed(mb >= 1 ? 1 : 2)} MB`;
}
