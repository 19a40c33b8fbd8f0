import {
  formatElevationRange,
  formatFileSize,
  formatNodataShare,
  formatPixelSize,
  formatModelResolution,
  formatResolution,
} from '../../../web/app/terrain/terrain-format';

describe('terrain-format', () => {
  it('writes file sizes in decimal units', () => {
    expect(formatFileSize(512)).toBe('512 B');
    expect(formatFileSize(927_172)).toBe('927 kB');
    expect(formatFileSize(1_024_000_000)).toBe('1.0 GB');
  });

  it('writes the elevation range with thin-space thousands, or a dash while unknown', () => {
    expect(formatElevationRange({ minElevationM: 684.7, maxElevationM: 2858.7 })).toBe('685 – 2\u2009859 m');
    expect(formatElevationRange({ minElevationM: null, maxElevationM: null })).toBe('—');
  });

  it('writes resolution and grid size as analysts read them', () => {
    expect(formatResolution(20)).toBe('20 m');
    expect(formatResolution(30.92)).toBe('30.9 m');
    expect(formatResolution(0.5)).toBe('0.50 m');
    expect(formatPixelSize({ widthPx: 10_000, heightPx: 800 })).toBe('10\u2009000 × 800 px');
  });

  it('writes a geographic grid in arc-seconds with its metres at the centre (issue 10: a 30″ grid read "744.5 m")', () => {
    const model: Parameters<typeof formatModelResolution>[0] = {
      resolutionM: 744.5,
      pixelSize: { x: 30 / 3600, y: 30 / 3600, unit: 'degree' },
      footprint: {
        type: 'Polygon',
        coordinates: [
          [
            [10, 44],
            [10, 46],
            [12, 46],
            [12, 44],
            [10, 44],
          ],
        ],
      },
    };

    // At 45°: 30″ of longitude ≈ 111 320 m × cos 45° / 120 ≈ 656 m; of latitude ≈ 926 m.
    expect(formatModelResolution(model)).toBe('30″ (about 656 × 926 m at the centre)');
  });

  it('writes a projected grid in metres, and feet with metres beside them', () => {
    expect(formatModelResolution({ resolutionM: 20, pixelSize: { x: 20, y: 20, unit: 'metre' }, footprint: null })).toBe('20 m');
    expect(formatModelResolution({ resolutionM: 3.048, pixelSize: { x: 10, y: 10, unit: 'foot' }, footprint: null })).toBe('10 ft (3.0 m)');
  });

  it('writes the nodata share as a percentage', () => {
    expect(formatNodataShare(0)).toBe('none');
    expect(formatNodataShare(0.0004)).toBe('< 0.1 %');
    expect(formatNodataShare(0.0123)).toBe('1.2 %');
    expect(formatNodataShare(null)).toBe('—');
  });
});
