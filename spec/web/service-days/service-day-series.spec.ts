import { riskRank } from '@shared/presentation/index';
import { RESERVE_COLOUR, orderBlocks, socChartSeries, worsenedDescents } from '../../../web/app/service-days/service-day-series';
import { ROUTE_A, blockResult, result } from './fixtures';

describe('the service-day result series', () => {
  it('lists the blocks that cannot be worked first, the lowest SOC first, then the rest by name', () => {
    const ordered = orderBlocks([
      blockResult('Block 10'),
      blockResult('Block 2', { feasible: false, minSoc: 0.12 }),
      blockResult('Block 9'),
      blockResult('Block 3', { feasible: false, minSoc: 0.04 }),
    ]);
    expect(ordered.map((block) => block.blockId)).toEqual(['Block 3', 'Block 2', 'Block 9', 'Block 10']);
  });

  it('puts every block on one chart in hours and percent, with the reserve as a dashed line across the day', () => {
    const series = socChartSeries(result([blockResult('B1'), blockResult('B2', { feasible: false })]), 0.15);
    expect(series.map((line) => line.label)).toEqual(['Block B1', 'Block B2 (cannot be worked)', 'Reserve (15 %)']);
    expect(series[0]!.x).toEqual([6, 9, 12]);
    expect(series[0]!.y[0]).toBeCloseTo(95, 9);
    expect(series[0]!.color).not.toBe(series[1]!.color);
    expect(series[2]).toMatchObject({ x: [6, 12], y: [15, 15], dashed: true, color: RESERVE_COLOUR });
  });

  it('lists only the descents the day made riskier, the riskiest first', () => {
    const descent = (risk: 'low' | 'elevated' | 'high' | 'critical', worsenedByDay: boolean, peakBrakeTempC: number) => ({
      tripIndex: 1,
      routeId: ROUTE_A,
      direction: 'inbound' as const,
      startM: 100,
      endM: 2_100,
      dropM: 180,
      arrivalSoc: 0.9,
      arrivalBrakeTempC: 140,
      peakBrakeTempC,
      risk,
      standaloneRisk: 'low' as const,
      worsenedByDay,
    });
    const listed = worsenedDescents(
      [
        blockResult('B1', { descents: [descent('elevated', true, 320), descent('low', false, 150)] }),
        blockResult('B2', { descents: [descent('high', true, 410)] }),
      ],
      riskRank,
    );
    expect(listed.map((item) => [item.blockId, item.descent.risk])).toEqual([
      ['B2', 'high'],
      ['B1', 'elevated'],
    ]);
  });
});
