import { describe, expect, it } from 'vitest';
import { vehicleSchema } from '../../../shared/domain/analysis';
import { presetVehicle, VEHICLE_PRESETS } from '../../../shared/engine/vehicle-presets';

describe('VEHICLE_PRESETS', () => {
  it.each(VEHICLE_PRESETS.map((preset) => [preset.id, preset] as const))(
    '%s satisfies the vehicle contract in every load and season',
    (_id, preset) => {
      for (const load of ['empty', 'seated', 'full'] as const) {
        for (const season of ['winter', 'summer', 'mild'] as const) {
          expect(() => vehicleSchema.parse(presetVehicle(preset.id, load, season))).not.toThrow();
        }
      }
      expect(preset.payloadKg.empty).toBeLessThan(preset.payloadKg.seated);
      expect(preset.payloadKg.seated).toBeLessThan(preset.payloadKg.full);
    },
  );

  it('keeps a 12 m battery bus within the EU 19.5 t two-axle limit at full load (Dir. (EU) 2015/719)', () => {
    const bus = presetVehicle('battery-bus-12m', 'full');

    expect(bus.curbMassKg + bus.payloadKg).toBeLessThanOrEqual(19_500);
  });

  it('gives the tram the steel-wheel rolling resistance 0.001–0.003 (Engineering ToolBox, engineeringarchives)', () => {
    const tram = presetVehicle('light-rail-vehicle');

    expect(tram.rollingResistanceCoefficient).toBeGreaterThanOrEqual(0.001);
    expect(tram.rollingResistanceCoefficient).toBeLessThanOrEqual(0.003);
    expect(tram.powerSource).toBe('overhead-line');
  });

  it('throws naming presetId for an unknown preset', () => {
    expect(() => presetVehicle('no-such-vehicle')).toThrow(/presetId/);
  });
});
