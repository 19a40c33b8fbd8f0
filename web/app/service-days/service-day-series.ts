import type { BlockResult, ServiceDayResult } from '@shared/domain/service-days';
import type { ChartSeries } from '../charts/distance-chart';

import { BLOCK_COLOURS, RESERVE_COLOUR } from '@shared/presentation/index';

export { BLOCK_COLOURS, RESERVE_COLOUR, orderBlocks } from '@shared/presentation/index';

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
    series.push({
      label: `Reserve (${Math.round(reserveSoc * 100)} %)`,
      x: [from, to],
      y: [reserveSoc * 100, reserveSoc * 100],
      color: RESERVE_COLOUR,
      dashed: true,
    });
  }
  return series;
}

/** A descent whose risk rose because of what came before, with the block it belongs to. */
export interface WorsenedDescent {
  blockId: string;
  descent: BlockResult['descents'][number];
}

/** Every descent the day made worse, the riskiest first. */
export function worsenedDescents(
  blocks: readonly BlockResult[],
  rank: (risk: BlockResult['descents'][number]['risk']) => number,
): WorsenedDescent[] {
  return blocks
    .flatMap((block) => block.descents.filter((descent) => descent.worsenedByDay).map((descent) => ({ blockId: block.blockId, descent })))
    .sort((a, b) => rank(b.descent.risk) - rank(a.descent.risk) || b.descent.peakBrakeTempC - a.descent.peakBrakeTempC);
}
