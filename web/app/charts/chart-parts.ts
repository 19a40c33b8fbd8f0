import { Filler, Legend, LineController, LineElement, LinearScale, PointElement, Tooltip, type ChartComponentLike } from 'chart.js';

/**
 * The only chart.js parts Descentry uses: line charts on linear axes, area fills, tooltips and a
 * legend. Registering these instead of every registerable keeps the chart screens' bundle small.
 */
export const CHART_PARTS: ChartComponentLike[] = [LineController, LineElement, PointElement, LinearScale, Filler, Tooltip, Legend];
