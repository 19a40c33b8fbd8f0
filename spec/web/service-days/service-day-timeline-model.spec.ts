import { estimatedArrivalS, timelinePercent, timelineRows, timelineSpan } from '../../../web/app/service-days/service-day-timeline-model';
import { ROUTE_A, ROUTE_B, block, blockResult, lookup, result } from './fixtures';

const h = (hours: number, minutes = 0) => hours * 3600 + minutes * 60;

describe('the service-day timeline rows', () => {
  it('estimates an arrival from the route length at 18 km/h: 9 km take 30 min', () => {
    expect(estimatedArrivalS(h(6, 30), 9_000)).toBe(h(7));
    expect(estimatedArrivalS(h(6, 30), 6_000)).toBe(h(6, 50));
  });

  it('draws each trip from departure to arrival and the gaps between them as layovers', () => {
    const [row] = timelineRows(
      [
        block('B1', [
          [ROUTE_A, h(6, 30), 'outbound'],
          [ROUTE_A, h(7, 15), 'inbound'],
          [ROUTE_B, h(8), 'outbound'],
        ]),
      ],
      lookup,
    );
    expect(row!.bars.map((bar) => [bar.kind, bar.startS, bar.endS])).toEqual([
      ['trip', h(6, 30), h(7)],
      ['trip', h(7, 15), h(7, 45)],
      ['trip', h(8), h(8, 20)],
    ]);
    expect(row!.layovers).toEqual([
      { startS: h(7), endS: h(7, 15) },
      { startS: h(7, 45), endS: h(8) },
    ]);
    expect(row!.bars[0]!.label).toBe('Trip 1: Brackenfold – Upper Tarn outbound, 06:30–07:00');
    expect(row!.warnings).toEqual([]);
    expect(row!.feasible).toBeNull();
  });

  it('says when a trip would still be driving at the next departure, or trips are out of order', () => {
    const [tight] = timelineRows(
      [
        block('B2', [
          [ROUTE_A, h(6, 30), 'outbound'],
          [ROUTE_A, h(6, 50), 'inbound'],
        ]),
      ],
      lookup,
    );
    expect(tight!.warnings).toEqual(['Trip 1 arrives about 07:00, after trip 2 leaves at 06:50.']);
    expect(tight!.layovers).toEqual([]);
    const [swapped] = timelineRows(
      [
        block('B3', [
          [ROUTE_A, h(9), 'outbound'],
          [ROUTE_A, h(7), 'inbound'],
        ]),
      ],
      lookup,
    );
    expect(swapped!.warnings[0]).toMatch(/Trip 2 leaves before trip 1/);
  });

  it('says when pull-in comes before the last arrival', () => {
    const [row] = timelineRows([block('B4', [[ROUTE_A, h(11, 45), 'outbound']], { pullInS: h(12) })], lookup);
    expect(row!.warnings).toEqual(['Pull-in at 12:00 is before the last trip arrives (about 12:15).']);
  });

  it('marks charging stops and the verdict from a run', () => {
    const run = result([
      blockResult('B1', {
        feasible: false,
        chargingEvents: [
          { chargerKey: 'tarn', startS: h(7), endS: h(7, 12), energyWh: 20_000, gridEnergyWh: 21_700, socBefore: 0.5, socAfter: 0.6 },
        ],
      }),
    ]);
    const [row] = timelineRows(
      [
        block('B1', [
          [ROUTE_A, h(6, 30), 'outbound'],
          [ROUTE_A, h(7, 15), 'inbound'],
        ]),
      ],
      lookup,
      run,
    );
    expect(row!.bars.filter((bar) => bar.kind === 'charge').map((bar) => [bar.startS, bar.endS, bar.label])).toEqual([
      [h(7), h(7, 12), 'Charging at tarn, 07:00–07:12'],
    ]);
    expect(row!.feasible).toBe(false);
  });

  it('labels a depot charger’s cabin pre-conditioning before pull-out as such, not as charging', () => {
    const run = result([
      blockResult('B1', {
        chargingEvents: [
          {
            chargerKey: 'depot',
            purpose: 'preconditioning',
            startS: h(6),
            endS: h(6, 20),
            energyWh: 0,
            gridEnergyWh: 3_000,
            socBefore: 0.95,
            socAfter: 0.95,
          },
          {
            chargerKey: 'tarn',
            purpose: 'charging',
            startS: h(7),
            endS: h(7, 12),
            energyWh: 20_000,
            gridEnergyWh: 21_700,
            socBefore: 0.5,
            socAfter: 0.6,
          },
        ],
      }),
    ]);
    const [row] = timelineRows(
      [
        block('B1', [
          [ROUTE_A, h(6, 30), 'outbound'],
          [ROUTE_A, h(7, 15), 'inbound'],
        ]),
      ],
      lookup,
      run,
    );
    expect(row!.bars.filter((bar) => bar.kind === 'charge').map((bar) => bar.label)).toEqual([
      'Cabin pre-conditioning at depot, 06:00–06:20',
      'Charging at tarn, 07:00–07:12',
    ]);
  });

  it('spans whole hours around every block and places times in percent of it', () => {
    const rows = timelineRows([block('B1', [[ROUTE_A, h(6, 30), 'outbound']], { pullOutS: h(5, 40), pullInS: h(9, 10) })], lookup);
    const span = timelineSpan(rows);
    expect(span).toEqual({ fromS: h(5), toS: h(10) });
    expect(timelinePercent(h(7, 30), span)).toBeCloseTo(50, 9);
    expect(timelineSpan([])).toEqual({ fromS: h(6), toS: h(22) });
  });
});
