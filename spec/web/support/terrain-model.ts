import type { TerrainModel } from '@shared/domain/terrain';

/** A ready terrain model as the API describes it (the Korvel valley), with `overrides`. */
export function terrainModel(overrides: Partial<TerrainModel> = {}): TerrainModel {
  return {
    id: '2b0f2d4e-8a57-4a55-9f7c-3a1d2c3b4a5e',
    name: 'Korvel valley',
    status: 'ready',
    failureReason: null,
    crs: 'EPSG:32632',
    crsName: 'WGS 84 / UTM zone 32N',
    widthPx: 800,
    heightPx: 600,
    resolutionM: 20,
    pixelSize: { x: 20, y: 20, unit: 'metre' },
    nodata: -9999,
    dataType: 'Float32',
    pixelType: 'area',
    verticalUnit: 'metre',
    fileSizeBytes: 927_172,
    sha256: 'a'.repeat(64),
    minElevationM: 684.7,
    maxElevationM: 2858.7,
    nodataShare: 0,
    spikeCount: 0,
    qualityNotes: ['No nodata pixels: the model is complete.'],
    footprint: {
      type: 'Polygon',
      coordinates: [
        [
          [10.4, 46.6],
          [10.4, 46.7],
          [10.6, 46.7],
          [10.4, 46.6],
        ],
      ],
    },
    uploadedBy: null,
    createdAt: '2026-06-01T08:00:00.000Z',
    readyAt: '2026-06-01T08:00:05.000Z',
    ...overrides,
  };
}
