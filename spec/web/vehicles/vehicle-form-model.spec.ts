import type { VehicleProfileDraftInput } from '@shared/domain/vehicle-profiles';
import { vehicleProfileDraftSchema } from '@shared/domain/vehicle-profiles';
import {
  VEHICLE_FIELDS,
  crossFieldMessages,
  fieldMessage,
  toVehicleDraft,
  toVehicleFormValue,
} from '../../../web/app/vehicles/vehicle-form-model';

describe('vehicle form model', () => {
  it('shows SI values in natural units (t, kW, kWh, %, km/h)', () => {
    const numbers = toVehicleFormValue(aProfile()).numbers;

    expect(numbers['curbMass']).toBe(13.5);
    expect(numbers['tractionPower']).toBe(250);
    expect(numbers['batteryCapacity']).toBe(350);
    expect(numbers['drivetrainEfficiency']).toBeCloseTo(86.2, 6);
    expect(numbers['regenMinSpeed']).toBeCloseTo(5, 6);
  });

  it('maps the form back to a draft the contract accepts, in SI', () => {
    const draft = toVehicleDraft(toVehicleFormValue(aProfile()), 'battery-bus-12m');

    expect(vehicleProfileDraftSchema.safeParse(draft).success).toBe(true);
    expect(draft.vehicle.curbMassKg).toBe(13_500);
    expect(draft.vehicle.tractionPowerW).toBe(250_000);
    expect(draft.vehicle.drivetrainEfficiency).toBeCloseTo(0.862, 9);
    expect(draft.seasons.winter).toEqual({ ambientC: -10, auxPowerW: 22_000 });
    expect(draft.vehicle.payloadKg).toBe(2_100);
  });

  it('covers every engine parameter of the contract', () => {
    const draft = toVehicleDraft(toVehicleFormValue(aProfile()), 'battery-bus-12m');

    expect(Object.keys(draft.vehicle).sort()).toEqual(
      [
        'curbMassKg', 'payloadKg', 'frontalAreaM2', 'dragCoefficient', 'rollingResistanceCoefficient', 'rotatingMassFactor',
        'tractionPowerW', 'regenPowerW', 'drivetrainEfficiency', 'regenEfficiency', 'batteryCapacityWh', 'maxChargePowerW',
        'auxPowerW', 'maxTractionForceN', 'brakeType', 'brakeThermalMassJPerK', 'brakeCoolingAreaM2', 'brakeHeatShare',
        'brakeEmissivity', 'retarderPowerW', 'lineReceptivity', 'powerSource', 'socTaperStart', 'socCeiling', 'regenMinSpeedMps',
      ].sort(),
    );
  });

  it('asks for a value when a field is empty', () => {
    expect(fieldMessage(field('curbMass'), null)).toBe('Enter a value (0.1 to 200 t).');
  });

  it('says how high a value may go, with its unit', () => {
    expect(fieldMessage(field('drivetrainEfficiency'), 120)).toBe('At most 100 %.');
  });

  it('refuses zero where the engine needs more than zero', () => {
    expect(fieldMessage(field('tractionPower'), 0)).toBe('Must be more than 0 kW.');
  });

  it('accepts a value inside the limits', () => {
    expect(fieldMessage(field('rollingResistance'), 0.007)).toBeNull();
  });

  it('flags a charge taper that starts above the SOC ceiling', () => {
    const value = toVehicleFormValue(aProfile());
    value.numbers['socTaperStart'] = 97;

    expect(crossFieldMessages(value)['socTaperStart']).toBe('Must not be above the SOC at which charging stops.');
  });

  it('asks a battery vehicle for battery energy above 0', () => {
    const value = toVehicleFormValue(aProfile());
    value.numbers['batteryCapacity'] = 0;

    expect(crossFieldMessages(value)['batteryCapacity']).toMatch(/above 0 kWh/);
    expect(crossFieldMessages({ ...value, powerSource: 'overhead-line' })['batteryCapacity']).toBeUndefined();
  });
});

// Helpers

function field(key: string) {
  const found = VEHICLE_FIELDS.find((candidate) => candidate.key === key);
  if (!found) throw new Error(`No field ${key}`);
  return found;
}

function aProfile(): VehicleProfileDraftInput {
  return {
    name: '12 m battery bus',
    description: '',
    vehicleClass: 'battery-bus-12m',
    loadsKg: { empty: 0, seated: 2_100, 'full-standing': 5_950 },
    passengerMassKg: 70,
    seasons: {
      winter: { ambientC: -10, auxPowerW: 22_000 },
      mild: { ambientC: 10, auxPowerW: 6_000 },
      summer: { ambientC: 28, auxPowerW: 14_000 },
    },
    vehicle: {
      curbMassKg: 13_500,
      payloadKg: 2_100,
      frontalAreaM2: 8,
      dragCoefficient: 0.7,
      rollingResistanceCoefficient: 0.007,
      rotatingMassFactor: 0.08,
      tractionPowerW: 250_000,
      regenPowerW: 200_000,
      drivetrainEfficiency: 0.862,
      regenEfficiency: 0.862,
      batteryCapacityWh: 350_000,
      maxChargePowerW: 300_000,
      auxPowerW: 6_000,
      regenMinSpeedMps: 5 / 3.6,
    },
  };
}
