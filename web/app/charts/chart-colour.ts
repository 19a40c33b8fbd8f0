// Kept apart from distance-chart.ts so that code which only computes chart colours (the risk
// bands of the result and review screens) does not load the chart code with it: the charts can
// then be deferred until they are shown.

/** `#rrggbb` → `rgba(r, g, b, alpha)`. */
export function withAlpha(hexColor: string, alpha: number): string {
  const match = /^#([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(hexColor);
  if (!match) return hexColor;
  const [r, g, b] = match.slice(1).map((part) => Number.parseInt(part, 16));
  return `rgba(${r}, ${g}, ${b}, ${alpha})`;
}
