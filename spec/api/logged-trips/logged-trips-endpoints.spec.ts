import request from 'supertest';
import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { loggedTripCreatedSchema, replayComparisonSchema } from '@shared/domain/logged-trips';
import { ensureVehiclePresets, presetProfileId } from '../../../api/vehicle-profiles/vehicle-presets-seed';
import { createTestContext } from '../../support/test-app';
import { sessionCookies } from '../../support/session-cookie';
import { countRows, truncateAll } from '../../support/test-database';
import { aLoggedTripCsv, aProfileDraft, testRoad, TRUE_VEHICLE } from '../../support/logged-trip-fixtures';

const context = createTestContext();
const { app, db } = context;
let cookieFor: ReturnType<typeof sessionCookies>;
let analyst: string;
let profileId: string;
let goodCsv: string;

beforeEach(async () => {
  await truncateAll(db);
  await ensureVehiclePresets(db);
  cookieFor = sessionCookies(db, context.deps.config);
  analyst = await cookieFor('analyst');
  profileId = (await request(app).post('/api/vehicles').set('Cookie', analyst).send(aProfileDraft())).body.id;
  goodCsv ??= await aLoggedTripCsv();
});
afterAll(() => context.close());

describe('POST /api/vehicles/:vehicleProfileId/logged-trips', () => {
  it('stores a trip on the route it was given and answers its samples, duration and length', async () => {
    const routeId = await aSavedRoute();

    const response = await upload(goodCsv, { routeId, payloadKg: '2240' });

    expect(response.status).toBe(201);
    const body = loggedTripCreatedSchema.parse(response.body);
    expect(body.samples).toBe(goodCsv.trim().split('\n').length - 1);
    expect(body.durationS).toBeGreaterThan(400);
    // The test road is 6.13 km along the ground; the trip covers it but for GPS scatter at the ends.
    expect(body.lengthM).toBeGreaterThan(6_050);
    expect(body.lengthM).toBeLessThan(6_200);
    expect(body.trip).toMatchObject({
      routeId,
      routeCreated: 'given',
      direction: 'forward',
      payloadKg: 2_240,
      payloadSource: 'given',
      ambientC: 8,
      elevationSource: 'route',
    });
    expect(body.trip.channels).toMatchObject({ batteryPower: true, soc: true, brakeTemperature: true, elevation: true });
    expect(body.trip.gps.method).toMatch(/Savitzky–Golay/);
    expect(body.trip.gps.p95OffsetM).toBeLessThan(10);
    expect(response.headers['location']).toBe(`/api/logged-trips/${body.loggedTripId}`);
  });

  it('matches a saved route by itself, and a trip driven the other way runs it in reverse', async () => {
    const routeId = await aSavedRoute();
    const reversed = await aLoggedTripCsv({
      request: {
        route: { type: 'LineString', coordinates: [...testRoad()].reverse() },
        vehicle: TRUE_VEHICLE,
        conditions: { ambientC: 8, startSoc: 0.6 },
        options: { speedLimitKph: 50 },
      },
    });

    const forward = await upload(goodCsv);
    const backward = await upload(reversed);

    expect(forward.body.trip).toMatchObject({ routeId, routeCreated: 'matched', direction: 'forward' });
    expect(backward.status).toBe(201);
    expect(backward.body.trip).toMatchObject({ routeId, routeCreated: 'matched', direction: 'reverse' });
  });

  it('makes a new route from the track when no saved route matches', async () => {
    const response = await upload(goodCsv, { name: 'Morning run' });

    expect(response.status).toBe(201);
    expect(response.body.trip).toMatchObject({ routeCreated: 'created', routeName: 'Logged route: Morning run', elevationSource: 'file' });
    expect(await countRows(db, 'road_routes')).toBe(1);
    const route = await request(app).get(`/api/routes/${response.body.trip.routeId}`).set('Cookie', analyst);
    expect(route.body.lengthM).toBeGreaterThan(6_000);
  });

  it('does not match a deleted route: the trip makes a new route instead', async () => {
    const deletedRouteId = await aSavedRoute();
    const planner = await cookieFor('planner');
    expect((await request(app).delete(`/api/routes/${deletedRouteId}`).set('Cookie', planner)).status).toBe(204);

    const response = await upload(goodCsv, { name: 'Morning run' });

    expect(response.status).toBe(201);
    expect(response.body.trip).toMatchObject({ routeCreated: 'created', routeName: 'Logged route: Morning run' });
    expect(response.body.trip.routeId).not.toBe(deletedRouteId);
  });

  it('ignores columns it does not know and lists them', async () => {
    const lines = goodCsv.trim().split('\n');
    const csv = [`${lines[0]},driver_id,odometer_km`, ...lines.slice(1).map((line) => `${line},D17,1234.5`)].join('\n');

    const response = await upload(csv, { routeId: await aSavedRoute() });

    expect(response.status).toBe(201);
    expect(response.body.trip.ignoredColumns).toEqual(['driver_id', 'odometer_km']);
  });

  it('refuses a trip that does not follow the route it names, naming the farthest row', async () => {
    const elsewhere = (
      await request(app)
        .post('/api/routes')
        .set('Cookie', await cookieFor('planner'))
        .send({
          name: 'Other road',
          geometry: {
            type: 'LineString',
            coordinates: [
              [10.4, 46.6, 800],
              [10.45, 46.6, 800],
            ],
          },
        })
    ).body.id;

    const response = await upload(goodCsv, { routeId: elsewhere });

    expect(response.status).toBe(400);
    expect(response.body.error.code).toBe('trip_off_route');
    expect(response.body.error.message).toMatch(/row \d+, column lat, lon: the trip does not follow the route “Other road”/);
    expect(await countRows(db, 'logged_trips')).toBe(0);
  });

  it('refuses a preset (read-only class) with 409', async () => {
    const response = await upload(goodCsv, {}, presetProfileId('battery-bus-12m'));

    expect(response.status).toBe(409);
    expect(response.body.error.code).toBe('preset_read_only');
  });

  describe('refusals of malformed files name the row and column and store nothing', () => {
    const cases: { what: string; edit: (lines: string[]) => string[]; code: string; message: RegExp }[] = [
      {
        what: 'a missing required column',
        edit: (l) => dropColumn(l, 'speed_mps'),
        code: 'missing_column',
        message: /row 1, column speed_mps \(or speed_kph\): the required column/,
      },
      { what: 'no header row', edit: (l) => l.slice(1), code: 'missing_header', message: /row 1: the first row must be a header/ },
      {
        what: 'semicolons instead of commas',
        edit: (l) => l.map((line) => line.replaceAll(',', ';')),
        code: 'not_csv',
        message: /row 1: .*comma-separated/,
      },
      {
        what: 'times out of order',
        edit: (l) => swap(l, 10, 11),
        code: 'unordered_time',
        message: /row 11, column time_s: the time \(8 s\) is earlier than the previous row's \(9 s\); rows must be in time order/,
      },
      {
        what: 'a repeated time',
        edit: (l) => setCell(l, 12, 'time_s', cell(l, 11, 'time_s')),
        code: 'duplicate_time',
        message: /row 12, column time_s: the time repeats/,
      },
      {
        what: 'a gap in the log',
        edit: (l) => [...l.slice(0, 20), ...l.slice(40)],
        code: 'time_gap',
        message: /row 21, column time_s: 21\.0 s have passed since the previous row; the longest gap allowed is 10 s/,
      },
      {
        what: 'an impossible latitude',
        edit: (l) => setCell(l, 30, 'lat', '95.2'),
        code: 'impossible_value',
        message: /row 30, column lat: 95\.2 ° is outside the possible range −?-?90–90/,
      },
      {
        what: 'a negative speed',
        edit: (l) => setCell(l, 31, 'speed_mps', '-3'),
        code: 'impossible_value',
        message: /row 31, column speed_mps: -3 m\/s is outside the possible range/,
      },
      {
        what: 'a SOC in per cent in the soc column',
        edit: (l) => setCell(l, 32, 'soc', '93'),
        code: 'impossible_value',
        message: /row 32, column soc: .*soc_percent/,
      },
      {
        what: 'an impossible jump in speed',
        edit: (l) => setCell(l, 50, 'speed_mps', '40'),
        code: 'impossible_value',
        message: /row 50, column speed_mps: the speed changes by/,
      },
      {
        what: 'text where a number belongs',
        edit: (l) => setCell(l, 33, 'battery_power_w', 'n/a'),
        code: 'invalid_value',
        message: /row 33, column battery_power_w: "n\/a" is not a number/,
      },
      {
        what: 'an empty required cell',
        edit: (l) => setCell(l, 34, 'lon', ''),
        code: 'missing_value',
        message: /row 34, column lon: the cell is empty/,
      },
      {
        what: 'a row with too few values',
        edit: (l) => l.map((line, i) => (i === 35 ? line.split(',').slice(0, 3).join(',') : line)),
        code: 'invalid_row',
        message: /row 36: expected \d+ comma-separated values/,
      },
      {
        what: 'voltage without current',
        edit: (l) => renameColumn(l, 'battery_power_w', 'battery_voltage_v'),
        code: 'missing_column',
        message: /row 1, column battery_current_a: battery_voltage_v needs battery_current_a/,
      },
      {
        what: 'a timestamp without a time zone',
        edit: (l) =>
          toTimestamps(
            l,
            (t) => `2026-03-14T07:${String(Math.floor(t / 60) % 60).padStart(2, '0')}:${String(Math.floor(t % 60)).padStart(2, '0')}`,
          ),
        code: 'invalid_value',
        message: /row 2, column timestamp: "2026-03-14T07:00:00" is not an ISO 8601 date and time with a time-zone offset/,
      },
    ];
    for (const { what, edit, code, message } of cases) {
      it(`refuses ${what}`, async () => {
        const routeId = await aSavedRoute();
        const csv = edit(goodCsv.trim().split('\n')).join('\n');

        const response = await upload(csv, { routeId });

        expect(response.status).toBe(400);
        expect(response.body.error.code).toBe(code);
        expect(response.body.error.message).toMatch(message);
        expect(await countRows(db, 'logged_trips')).toBe(0);
        expect(await countRows(db, 'road_routes')).toBe(1);
      });
    }

    it('refuses an empty file', async () => {
      const response = await upload('');

      expect(response.status).toBe(400);
      expect(response.body.error.code).toBe('empty_file');
    });

    it('refuses more rows than one trip may have with 413', async () => {
      const rows = ['time_s,lat,lon,speed_mps'];
      for (let i = 0; i <= 100_000; i++) rows.push(`${i},46.5,10.3,0`);

      const response = await upload(rows.join('\n'));

      expect(response.status).toBe(413);
      expect(response.body.error.code).toBe('too_many_rows');
      expect(response.body.error.message).toMatch(/row 100002: the file has more than 100,000 samples/);
    });

    it('reads ISO 8601 timestamps with an offset and km/h', async () => {
      const lines = goodCsv.trim().split('\n');
      const csv = renameColumn(
        toTimestamps(lines, (t) => new Date(Date.UTC(2026, 2, 14, 6, 0, 0) + t * 1000).toISOString().replace('Z', '+00:00')),
        'speed_mps',
        'speed_kph',
      ).map((line, i) => (i === 0 ? line : setSpeedKph(line, lines[0]!)));

      const response = await upload(csv.join('\n'), { routeId: await aSavedRoute() });

      expect(response.status).toBe(201);
      expect(response.body.trip.startedAt).toBe('2026-03-14T06:00:00.000Z');
      expect(response.body.lengthM).toBeGreaterThan(6_050);
    });
  });
});

describe('GET /api/logged-trips/:loggedTripId/comparison', () => {
  it('replays the trip on its measured speed and sets measured against modelled with the errors', async () => {
    const trip = (await upload(goodCsv, { routeId: await aSavedRoute(), payloadKg: '2240' })).body;

    const response = await request(app)
      .get(`/api/logged-trips/${trip.loggedTripId}/comparison`)
      .set('Cookie', await cookieFor('board'));

    expect(response.status).toBe(200);
    const comparison = replayComparisonSchema.parse(response.body);
    const n = comparison.series.distanceM.length;
    expect(comparison.series.modelledPowerW).toHaveLength(n);
    expect(comparison.series.measuredEnergyWh).toHaveLength(n);
    expect(comparison.series.timeS.at(-1)).toBeCloseTo(trip.durationS, 0);
    expect(comparison.basis).toMatchObject({ kind: 'profile', profileVersion: 1 });
    // The generic class loses less than the bus the trip was logged on: the model draws less.
    expect(comparison.power!.energyErrorPercent).toBeLessThan(-5);
    expect(comparison.power!.biasW).toBeLessThan(0);
    expect(comparison.power!.rmsErrorW).toBeGreaterThan(0);
    expect(comparison.soc!.rms).toBeGreaterThan(0);
    expect(comparison.brakeTemperature).not.toBeNull();
    expect(comparison.caution).toMatch(/engineering estimates/);
  });
});

describe('DELETE /api/logged-trips/:loggedTripId', () => {
  it('deletes a trip no accepted calibration was fitted on', async () => {
    const trip = (await upload(goodCsv, { routeId: await aSavedRoute() })).body;

    const response = await request(app).delete(`/api/logged-trips/${trip.loggedTripId}`).set('Cookie', analyst);

    expect(response.status).toBe(204);
    expect(await countRows(db, 'logged_trips')).toBe(0);
  });
});

// Helpers

async function aSavedRoute(): Promise<string> {
  const planner = await cookieFor('planner');
  const response = await request(app)
    .post('/api/routes')
    .set('Cookie', planner)
    .send({ name: 'Test road', geometry: { type: 'LineString', coordinates: testRoad() }, defaultSpeedLimitKph: 60 });
  return response.body.id as string;
}

function upload(csv: string, fields: Record<string, string> = {}, vehicleProfileId = profileId) {
  let call = request(app).post(`/api/vehicles/${vehicleProfileId}/logged-trips`).set('Cookie', analyst);
  for (const [key, value] of Object.entries(fields)) call = call.field(key, value);
  return call.attach('file', Buffer.from(csv), 'trip.csv');
}

function columnIndex(lines: string[], name: string): number {
  return lines[0]!.split(',').indexOf(name);
}

function cell(lines: string[], row: number, name: string): string {
  return lines[row - 1]!.split(',')[columnIndex(lines, name)]!;
}

/** Sets a cell; `row` counts the header as row 1. */
function setCell(lines: string[], row: number, name: string, value: string): string[] {
  const index = columnIndex(lines, name);
  return lines.map((line, i) => {
    if (i !== row - 1) return line;
    const cells = line.split(',');
    cells[index] = value;
    return cells.join(',');
  });
}

function swap(lines: string[], rowA: number, rowB: number): string[] {
  const out = [...lines];
  [out[rowA - 1], out[rowB - 1]] = [out[rowB - 1]!, out[rowA - 1]!];
  return out;
}

function dropColumn(lines: string[], name: string): string[] {
  const index = columnIndex(lines, name);
  return lines.map((line) =>
    line
      .split(',')
      .filter((_, i) => i !== index)
      .join(','),
  );
}

function renameColumn(lines: string[], from: string, to: string): string[] {
  return [
    lines[0]!
      .split(',')
      .map((name) => (name === from ? to : name))
      .join(','),
    ...lines.slice(1),
  ];
}

function toTimestamps(lines: string[], format: (t: number) => string): string[] {
  return [
    lines[0]!.replace('time_s', 'timestamp'),
    ...lines.slice(1).map((line) => {
      const cells = line.split(',');
      cells[0] = format(Number(cells[0]));
      return cells.join(',');
    }),
  ];
}

function setSpeedKph(line: string, header: string): string {
  const index = header.split(',').indexOf('speed_mps');
  const cells = line.split(',');
  cells[index] = (Number(cells[index]) * 3.6).toFixed(2);
  return cells.join(',');
}
