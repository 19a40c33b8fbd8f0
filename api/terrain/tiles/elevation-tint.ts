/**
 * Descentry's own elevation tint for map tiles: valley greens through upland sage and ochre to
 * rock and snow, chosen so the 600–2 000 m band where transit routes climb spreads over the most
 * distinct hues. Colours are interpolated linearly between stops, per whole metre: an elevation
 * takes the colour of its metre (floored), a step far below one colour level, which lets the tile
 * kernel look colours up in a table.
 */
export const ELEVATION_TINT_STOPS: ReadonlyArray<{ elevationM: number; rgb: readonly [number, number, number] }> = [
  { elevationM: -100, rgb: [78, 122, 140] },
  { elevationM: 200, rgb: [92, 138, 104] },
  { elevationM: 600, rgb: [128, 164, 102] },
  { elevationM: 1000, rgb: [178, 186, 118] },
  { elevationM: 1400, rgb: [214, 190, 128] },
  { elevationM: 1800, rgb: [196, 150, 108] },
  { elevationM: 2300, rgb: [156, 128, 118] },
  { elevationM: 2800, rgb: [184, 180, 182] },
  { elevationM: 3400, rgb: [246, 246, 250] },
];

/** Tint for an elevation (of its whole metre), written into `out` at `offset` (RGB bytes). */
export function tintInto(elevation: number, out: Uint8Array, offset: number): void {
  const stops = ELEVATION_TINT_STOPS;
  const elevationM = Math.floor(elevation);
  if (elevationM <= stops[0]!.elevationM) return writeRgb(stops[0]!.rgb, out, offset);
  for (let i = 1; i < stops.length; i++) {
    const upper = stops[i]!;
    if (elevationM <= upper.elevationM) {
      const lower = stops[i - 1]!;
      const t = (elevationM - lower.elevationM) / (upper.elevationM - lower.elevationM);
      out[offset] = lower.rgb[0] + (upper.rgb[0] - lower.rgb[0]) * t;
      out[offset + 1] = lower.rgb[1] + (upper.rgb[1] - lower.rgb[1]) * t;
      out[offset + 2] = lower.rgb[2] + (upper.rgb[2] - lower.rgb[2]) * t;
      return;
    }
  }
  writeRgb(stops[stops.length - 1]!.rgb, out, offset);
}

function writeRgb(rgb: readonly [number, number, number], out: Uint8Array, offset: number): void {
  out[offset] = rgb[0];
  out[offset + 1] = rgb[1];
  out[offset + 2] = rgb[2];
}
