import { scenarioDraftSchema } from '@shared/domain/scenarios';
import { DEFAULT_SCENARIO_FORM, toScenarioDraft, type ScenarioFormValue } from '../../../web/app/scenarios/scenario-form-model';

const ROUTE_ID = '0b7d6a52-3f1e-4c2a-9d7e-1a2b3c4d5e6f';
const VEHICLE_ID = '5e4d3c2b-1a09-4f8e-a7d6-c5b4a3928170';

describe('toScenarioDraft', () => {
  it('maps a load case, a named season and the options to the contract', () => {
    const draft = toScenarioDraft(aForm(), 'metric');

    expect(draft).toEqual({
      name: 'Pass road, winter',
      routeId: ROUTE_ID,
      direction: 'round-trip',
      vehicleProfileId: VEHICLE_ID,
      load: { kind: 'case', case: 'full-standing' },
      season: { kind: 'season', season: 'winter' },
      startSoc: 0.9,
      options: { spacingM: 10, smoothingWindowM: 150, useStops: true },
      inService: true,
    });
    expect(scenarioDraftSchema.safeParse(draft).success).toBe(true);
  });

  it('sends a passenger count instead of a load case', () => {
    const draft = toScenarioDraft(aForm({ load: 'passengers', passengers: 45 }), 'metric');

    expect(draft.load).toEqual({ kind: 'passengers', passengers: 45 });
  });

  it('sends a custom season in °C and W even when the form shows °F', () => {
    const draft = toScenarioDraft(aForm({ season: 'custom', customAmbient: 14, customAuxKw: 18.5 }), 'imperial');

    expect(draft.season).toEqual({ kind: 'custom', ambientC: -10, auxPowerW: 18_500 });
  });

  it('converts a descent speed cap from mph to km/h', () => {
    const draft = toScenarioDraft(aForm({ descentSpeedCap: 25 }), 'imperial');

    expect(draft.options?.descentSpeedCapKph).toBeCloseTo(40.2, 6);
  });

  it('pins the route version only when one is chosen', () => {
    expect(toScenarioDraft(aForm(), 'metric').routeVersion).toBeUndefined();
    expect(toScenarioDraft(aForm({ routeVersion: 3 }), 'metric').routeVersion).toBe(3);
  });

  it('trims the name', () => {
    expect(toScenarioDraft(aForm({ name: '  Valley line  ' }), 'metric').name).toBe('Valley line');
  });
});

// Helpers

function aForm(overrides: Partial<ScenarioFormValue> = {}): ScenarioFormValue {
  return {
    ...DEFAULT_SCENARIO_FORM,
    name: 'Pass road, winter',
    routeId: ROUTE_ID,
    vehicleProfileId: VEHICLE_ID,
    direction: 'round-trip',
    load: 'full-standing',
    season: 'winter',
    startSocPercent: 90,
    inService: true,
    ...overrides,
  };
}
