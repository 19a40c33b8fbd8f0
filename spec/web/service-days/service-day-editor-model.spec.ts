import {
  checkDraft,
  emptyDraft,
  fieldErrors,
  hasErrorWithin,
  newBlock,
  newCharger,
  nextTrip,
} from '../../../web/app/service-days/service-day-editor-model';
import { ROUTE_A, ROUTE_B, VEHICLE, block, lookup } from './fixtures';

const h = (hours: number, minutes = 0) => hours * 3600 + minutes * 60;
const lengthOf = (routeId: string) => lookup(routeId)?.lengthM;

describe('the service-day editor model', () => {
  it('proposes the next trip after the last arrival and a 10 min layover, on a five-minute mark, back the other way', () => {
    const trip = nextTrip(block('B1', [[ROUTE_A, h(6, 32), 'outbound']]), ROUTE_A, lengthOf);
    // 06:32 + 30 min running = 07:02, + 10 min layover = 07:12, next five-minute mark 07:15.
    expect(trip).toMatchObject({ routeId: ROUTE_A, direction: 'inbound', departureS: h(7, 15) });
    expect(nextTrip(block('B1', [[ROUTE_A, h(6, 32), 'outbound']]), ROUTE_B, lengthOf).direction).toBe('outbound');
  });

  it('starts a block’s first trip ten minutes after pull-out', () => {
    const empty = { ...block('B1', []), pullOutS: h(5, 50) };
    expect(nextTrip(empty, ROUTE_B, lengthOf)).toMatchObject({ departureS: h(6), direction: 'outbound' });
  });

  it('names new blocks and chargers so that no two share a name or key', () => {
    const depot = newCharger([], [10.1, 46.5], 'depot');
    expect(depot).toMatchObject({ key: 'charger-1', kind: 'depot', powerW: 100_000 });
    const terminus = newCharger([depot], [10.2, 46.6], 'terminus');
    expect(terminus.key).toBe('charger-2');
    const first = newBlock([], VEHICLE, [depot, terminus]);
    expect(first).toMatchObject({ blockId: 'Block 1', depotChargerKey: 'charger-1' });
    expect(newBlock([first, { ...first, blockId: 'Block 2' }], VEHICLE, []).blockId).toBe('Block 3');
  });

  it('finds what the API would refuse before sending, by field path', () => {
    const problems = checkDraft({
      ...emptyDraft(),
      name: ' ',
      blocks: [block('B1', []), block('B1', [[ROUTE_A, h(7), 'outbound']], { pullInS: h(5) })],
    });
    expect([...problems.keys()].sort()).toEqual(['blocks.0.trips', 'blocks.1.blockId', 'blocks.1.pullInS', 'name']);
    expect(checkDraft({ ...emptyDraft(), name: 'Winter weekday' }).get('blocks')).toBe('Add at least one block.');
  });

  it('reads the fields of a refused save from the validation issues or the one field named', () => {
    const errors = fieldErrors({ issues: [{ path: ['blocks', 2, 'trips', 0, 'departureS'], message: 'Too big' }] }, 'Invalid value');
    expect(errors.get('blocks.2.trips.0.departureS')).toBe('Too big');
    expect(hasErrorWithin(errors, 'blocks.2')).toBe(true);
    expect(hasErrorWithin(errors, 'blocks.1')).toBe(false);
    expect(fieldErrors({ path: ['blocks', 0, 'trips', 1, 'routeId'] }, 'Route not found').get('blocks.0.trips.1.routeId')).toBe(
      'Route not found',
    );
    expect(fieldErrors(undefined, 'x').size).toBe(0);
  });

  it('places the API’s 422 on the block, trip and field it names', () => {
    const trip = fieldErrors({ blockId: 'B2', blockIndex: 1, tripIndex: 3, field: 'departureS' }, 'trip 4 departs out of order');
    expect([...trip.entries()]).toEqual([['blocks.1.trips.3.departureS', 'trip 4 departs out of order']]);
    expect([...fieldErrors({ blockId: 'B1', blockIndex: 0, field: 'depotChargerKey' }, 'not a depot charger').keys()]).toEqual([
      'blocks.0.depotChargerKey',
    ]);
    expect([...fieldErrors({ field: 'chargers[2].key' }, 'key used twice').keys()]).toEqual(['chargers.2.name']);
  });
});
