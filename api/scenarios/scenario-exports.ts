/**
 * Scenario results as files: a per-point CSV (columns from the engine's series table, headers from the shared presentation module, units in brackets, one row per profile point
 * per direction, the caution on the first line as a "#" comment) and a GeoJSON FeatureCollection
 * (RFC 7946) of the route cut into per-segment LineStrings, plus one LineString per descent with
 * its risk and advice. The caution travels as a foreign member of the collection.
 */
import type { Scenario, ScenarioResult } from '@shared/domain/scenarios';
import { ENGINEERING_CAUTION } from '@shared/engine/constants';
import { CSV_SERIES } from '@shared/engine/profile-series';
import { DIRECTION_LABELS, profileCsvHeader } from '@shared/presentation/index';

export function scenarioCsv(result: ScenarioResult): string {
  const lines = [`# ${ENGINEERING_CAUTION}`, profileCsvHeader()];
  for (const direction of result.directions) {
    const p = direction.profile;
    for (let i = 0; i < p.distanceM.length; i++) {
      // In the order of PROFILE_COLUMNS: the direction, then the table's CSV series.
      const values = CSV_SERIES.map(({ name, csv }) => fixed(csv.toCsv(p[name][i]!), csv.decimals));
      lines.push([DIRECTION_LABELS[direction.direction], ...values].join(','));
    }
  }
  return `${lines.join('\r\n')}\r\n`;
}

export function scenarioGeoJson(scenario: Scenario, result: ScenarioResult) {
  const features: unknown[] = [];
  for (const direction of result.directions) {
    const p = direction.profile;
    for (let i = 0; i + 1 < p.distanceM.length; i++) {
      features.push({
        type: 'Feature',
        geometry: { type: 'LineString', coordinates: [position(p.lon[i]!, p.lat[i]!), position(p.lon[i + 1]!, p.lat[i + 1]!)] },
        properties: {
          kind: 'segment',
          direction: direction.direction,
          fromM: round(p.distanceM[i]!, 2),
          toM: round(p.distanceM[i + 1]!, 2),
          elevationM: round(p.elevationM[i]!, 2),
          gradePercent: round(p.gradePercent[i]!, 3),
          speedKph: round(p.speedMps[i]! * 3.6, 2),
          batteryPowerW: round(p.batteryPowerW[i]!, 0),
          regenPowerW: round(p.regenPowerW[i]!, 0),
          frictionBrakePowerW: round(p.frictionBrakePowerW[i]!, 0),
          soc: round(p.soc[i]!, 5),
          brakeTempC: round(p.brakeTempC[i]!, 2),
        },
      });
    }
    for (const descent of direction.descents) {
      const coordinates: [number, number][] = [];
      for (let i = 0; i < p.distanceM.length; i++) {
        if (p.distanceM[i]! >= descent.startM - 1e-6 && p.distanceM[i]! <= descent.endM + 1e-6)
          coordinates.push(position(p.lon[i]!, p.lat[i]!));
      }
      if (coordinates.length < 2) continue;
      features.push({
        type: 'Feature',
        geometry: { type: 'LineString', coordinates },
        properties: { kind: 'descent', direction: direction.direction, ...descent, caution: ENGINEERING_CAUTION },
      });
    }
  }
  return {
    type: 'FeatureCollection',
    name: scenario.name,
    scenarioId: scenario.id,
    engineVersion: result.engineVersion,
    computedAt: result.computedAt,
    caution: ENGINEERING_CAUTION,
    features,
  };
}

function position(lon: number, lat: number): [number, number] {
  return [round(lon, 7), round(lat, 7)];
}

function round(value: number, digits: number): number {
  const factor = 10 ** digits;
  return Math.round(value * factor) / factor;
}

function fixed(value: number, digits: number): string {
  return Number.isFinite(value) ? String(round(value, digits)) : '';
}
