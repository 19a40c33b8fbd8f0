import type { BlockResult, ServiceDayResult } from '@shared/domain/service-days';
import type { ChartSeries } from '../charts/distance-chart';

/** Line colours for the blocks on the SOC chart, repeated past twelve blocks; our own palette. */
export const BLOCK_COLOURS: readonly string[] = [
  '#0b5567', '#a0522d', '#3f7f4f', '#6a4c93', '#b8860b', '#1f6fb2',
  '#8b3a62', '#4f6d2f', '#c05a00', '#2e5e8c', '#7a5c3e', '#00796b',
];

/** Colour of the reserve line. */
export const RESERVE_COLOUR = '#b3261e';

/** Blocks that cannot be worked first (lowest SOC first among them), then the rest by block. */
export function orderBlocks(blocks: readonly BlockResult[]): BlockResult[] {
  return [...blocks].sort((a, b) => {
    if (a.feasible !== b.feasible) return a.feasible ? 1 : -1;
    if (!a.feasible) return a.minSoc - b.minSoc;
    return a.blockId.localeCompare(b.blockId, 'en', { numeric: true });
  });
}

/**
 * The SOC chart: one line per block (time of day in hours on x, SOC in percent on y) and the
 * reserve as a dashed line across the day.
 */
export function socChartSeries(result: ServiceDayResult, reserveSoc: number): ChartSeries[] {
  const series: ChartSeries[] = result.blocks.map((block, index) => ({
    label: block.feasible ? `Block ${block.blockId}` : `Block ${block.blockId} (cannot be worked)`,
    x: block.socTrace.map((point) => point.timeS / 3600),
    y: block.socTrace.map((point) => point.soc * 100),
    color: BLOCK_COLOURS[index % BLOCK_COLOURS.length]!,
  }));
  const times = result.blocks.flatMap((block) => block.socTrace.map((point) => point.timeS / 3600));
  if (times.length > 0) {
    const from = Math.floor(Math.min(...times));
    const to = Math.ceil(Math.max(...times));
    series.push({ label: `Reserve (${Math.round(reserveSoc * 100)} %)`, x: [from, to], y: [reserveSoc * 100, reserveSoc * 100], color: RESERVE_COLOUR, dashed: true });
  }
  return series;
}

/** A descent whose risk rose because of what came before, with the block it belongs to. */
export interface WorsenedDescent {
  blockId: string;
  descent: BlockResult['descents'][number];
}

/** Every descent the day made worse, the riskiest first. */
export function worsenedDescents(blocks: readonly BlockResult[], rank: (risk: BlockResult['descents'][number]['risk']) => number): WorsenedDescent[] {
  return blocks
    .flatMap((block) => block.descents.filter((descent) => descent.worsenedByDay).map((descent) => ({ blockId: block.blockId, descent })))
    .sort((a, b) => rank(b.descent.risk) - rank(a.descent.risk) || b.descent.peakBrakeTempC - a.descent.peakBrakeTempC);
}
