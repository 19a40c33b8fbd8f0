import { vehicleSchema } from '@shared/domain/analysis';
import type { VehicleProfileDraftInput } from '@shared/domain/vehicle-profiles';
import { climateSettingsSchema, vehicleProfileDraftSchema } from '@shared/domain/vehicle-profiles';
import { DEFAULT_CLIMATE } from '@shared/engine/constants';
import {
  VEHICLE_FIELDS,
  copPointsMessage,
  defaultCopPoints,
  fieldHint,
  isClimateField,
  toShownNumber,
  crossFieldMessages,
  fieldMessage,
  fieldUnit,
  profileNumbersBasis,
  switchUnits,
  toVehicleDraft,
  toVehicleFormValue,
} from '../../../web/app/vehicles/vehicle-form-model';

describe('vehicle form model', () => {
  it('shows SI values in natural units (t, kW, kWh, %, km/h)', () => {
    const numbers = toVehicleFormValue(aProfile(), 'metric').numbers;

    expect(numbers['curbMass']).toBe(13.5);
    expect(numbers['tractionPower']).toBe(250);
    expect(numbers['batteryCapacity']).toBe(350);
    expect(numbers['drivetrainEfficiency']).toBeCloseTo(86.2, 6);
    expect(numbers['regenMinSpeed']).toBeCloseTo(5, 6);
  });

  it('maps the form back to a draft the contract accepts, in SI', () => {
    const draft = toVehicleDraft(toVehicleFormValue(aProfile(), 'metric'), 'battery-bus-12m', 'metric');

    expect(vehicleProfileDraftSchema.safeParse(draft).success).toBe(true);
    expect(draft.vehicle.curbMassKg).toBe(13_500);
    expect(draft.vehicle.tractionPowerW).toBe(250_000);
    expect(draft.vehicle.drivetrainEfficiency).toBeCloseTo(0.862, 9);
    expect(draft.seasons.winter).toEqual({ ambientC: -10, auxPowerW: 22_000 });
    expect(draft.vehicle.payloadKg).toBe(2_100);
  });

  it('covers every engine parameter of the contract', () => {
    const draft = toVehicleDraft(toVehicleFormValue(aProfile(), 'metric'), 'battery-bus-12m', 'metric');

    expect(Object.keys(draft.vehicle).sort()).toEqual(
      [
        'curbMassKg',
        'payloadKg',
        'frontalAreaM2',
        'dragCoefficient',
        'rollingResistanceCoefficient',
        'rotatingMassFactor',
        'tractionPowerW',
        'regenPowerW',
        'drivetrainEfficiency',
        'regenEfficiency',
        'batteryCapacityWh',
        'maxChargePowerW',
        'auxPowerW',
        'maxTractionForceN',
        'brakeType',
        'brakeThermalMassJPerK',
        'brakeCoolingAreaM2',
        'brakeHeatShare',
        'brakeEmissivity',
        'retarderPowerW',
        'lineReceptivity',
        'powerSource',
        'socTaperStart',
        'socCeiling',
        'regenMinSpeedMps',
        'coldChargeFullFromC',
        'coldChargeShareAtMinus20C',
        'retarderType',
        'regenContinuousPowerW',
        'regenPeakHoldS',
        'drivenAxleLoadShare',
        'rearBrakeShare',
        'rearBrakeThermalMassShare',
        'permissibleGrossMassKg',
        'endOfLifeCapacityFraction',
        'endOfLifeChargePowerFraction',
      ].sort(),
    );
  });

  it('saves the safety fields of the vehicle as loaded, and leaves the optional ones unstated when empty', () => {
    const base = aProfile();
    const stated = {
      ...base,
      vehicle: {
        ...base.vehicle,
        retarderType: 'hydrodynamic' as const,
        regenContinuousPowerW: 120_000,
        regenPeakHoldS: 45,
        drivenAxleLoadShare: 0.62,
        rearBrakeShare: 0.58,
        permissibleGrossMassKg: 25_000,
      },
    };

    const kept = toVehicleDraft(toVehicleFormValue(stated, 'metric'), 'battery-bus-12m', 'metric');
    const value = toVehicleFormValue(stated, 'metric');
    const emptied = toVehicleDraft(
      { ...value, numbers: { ...value.numbers, regenContinuousPower: null, permissibleGrossMass: null } },
      'battery-bus-12m',
      'metric',
    );

    expect(value.numbers['permissibleGrossMass']).toBe(25);
    expect(value.numbers['drivenAxleLoadShare']).toBe(62);
    expect(kept.vehicle).toMatchObject({
      retarderType: 'hydrodynamic',
      regenContinuousPowerW: 120_000,
      regenPeakHoldS: 45,
      drivenAxleLoadShare: 0.62,
      rearBrakeShare: 0.58,
      permissibleGrossMassKg: 25_000,
    });
    expect(vehicleProfileDraftSchema.safeParse(kept).success).toBe(true);
    expect(emptied.vehicle.regenContinuousPowerW).toBeUndefined();
    expect(emptied.vehicle.permissibleGrossMassKg).toBeUndefined();
    expect(fieldMessage(field('permissibleGrossMass'), null, 'metric')).toBeNull();
  });

  it('reads an unstated endurance brake as the engine does, and refuses a continuous regeneration above the peak', () => {
    const base = aProfile();
    const value = toVehicleFormValue({ ...base, vehicle: { ...base.vehicle, retarderPowerW: 150_000 } }, 'metric');

    expect(value.retarderType).toBe('braking-resistor');
    expect(toVehicleFormValue({ ...base, vehicle: { ...base.vehicle, retarderPowerW: 0 } }, 'metric').retarderType).toBe('none');
    expect(crossFieldMessages({ ...value, numbers: { ...value.numbers, regenContinuousPower: 400 } })['regenContinuousPower']).toBe(
      'Must not be above the peak regenerative power.',
    );
  });

  it('asks for a value when a field is empty', () => {
    expect(fieldMessage(field('curbMass'), null, 'metric')).toBe('Enter a value (0.1 to 200 t).');
  });

  it('says how high a value may go, with its unit', () => {
    expect(fieldMessage(field('drivetrainEfficiency'), 120, 'metric')).toBe('At most 100 %.');
  });

  it('refuses zero where the engine needs more than zero', () => {
    expect(fieldMessage(field('tractionPower'), 0, 'metric')).toBe('Must be more than 0 kW.');
  });

  it('accepts a value inside the limits', () => {
    expect(fieldMessage(field('rollingResistance'), 0.007, 'metric')).toBeNull();
  });

  it('flags a charge taper that starts above the SOC ceiling', () => {
    const value = toVehicleFormValue(aProfile(), 'metric');
    value.numbers['socTaperStart'] = 97;

    expect(crossFieldMessages(value)['socTaperStart']).toBe('Must not be above the SOC at which charging stops.');
  });

  it('asks a battery vehicle for battery energy above 0', () => {
    const value = toVehicleFormValue(aProfile(), 'metric');
    value.numbers['batteryCapacity'] = 0;

    expect(crossFieldMessages(value)['batteryCapacity']).toMatch(/above 0 kWh/);
    expect(crossFieldMessages({ ...value, powerSource: 'overhead-line' })['batteryCapacity']).toBeUndefined();
  });
});

describe('vehicle form model in imperial units', () => {
  it('shows masses in short tons and pounds, forces in lbf, speeds in mph and temperatures in °F', () => {
    const numbers = toVehicleFormValue(aProfile(), 'imperial').numbers;

    // 13 500 kg ÷ 907.18474 kg/tn = 14.881…; 70 kg ÷ 0.45359237 kg/lb = 154.32…; shown with two
    // decimals, three below 10.
    expect(numbers['curbMass']).toBe(14.88);
    expect(numbers['loadFull']).toBe(6.559);
    expect(numbers['passengerMass']).toBe(154.32);
    expect(numbers['maxTractionForce']).toBe(7_868.31);
    expect(numbers['regenMinSpeed']).toBe(3.107);
    expect(numbers['winterAmbient']).toBe(14);
    expect(fieldUnit(field('curbMass'), 'imperial')).toBe('tn');
    expect(fieldUnit(field('passengerMass'), 'imperial')).toBe('lb');
  });

  it("shows areas in square feet and the brakes' thermal mass in BTU/°F", () => {
    const numbers = toVehicleFormValue(aProfile(), 'imperial').numbers;

    // 1 ft² = 0.09290304 m² exactly; 1 BTU/°F = 1 055.05585262 J × 1.8 per K (International Table BTU).
    expect(numbers['frontalArea']).toBe(86.11); // 8 / 0.09290304 = 86.111…
    expect(numbers['brakeCoolingArea']).toBe(17.22); // 1.6 / 0.09290304 = 17.222…
    expect(numbers['brakeThermalMass']).toBe(48.44); // 92 000 / 1 899.100534716 = 48.443…
    expect(fieldUnit(field('frontalArea'), 'imperial')).toBe('ft²');
    expect(fieldUnit(field('brakeThermalMass'), 'imperial')).toBe('BTU/°F');
    expect(fieldUnit(field('brakeThermalMass'), 'metric')).toBe('kJ/K');
  });

  it('leaves powers, energies, coefficients and percentages as they are', () => {
    const metric = toVehicleFormValue(aProfile(), 'metric').numbers;
    const imperial = toVehicleFormValue(aProfile(), 'imperial').numbers;

    for (const key of [
      'tractionPower',
      'batteryCapacity',
      'dragCoefficient',
      'rollingResistance',
      'drivetrainEfficiency',
      'socCeiling',
      'lineReceptivity',
    ]) {
      expect(imperial[key]).toBe(metric[key]);
      expect(fieldUnit(field(key), 'imperial')).toBe(fieldUnit(field(key), 'metric'));
    }
  });

  it('maps values typed in imperial units to an SI request body', () => {
    const value = toVehicleFormValue(aProfile(), 'metric');
    value.numbers = {
      ...value.numbers,
      curbMass: 15,
      loadEmpty: 0,
      loadSeated: 2.5,
      loadFull: 6,
      passengerMass: 165,
      maxTractionForce: 8_000,
      regenMinSpeed: 3,
      winterAmbient: 5,
      mildAmbient: 50,
      summerAmbient: 86,
      tractionPower: 250,
      drivetrainEfficiency: 90,
    };

    const draft = toVehicleDraft(value, 'battery-bus-12m', 'imperial');

    expect(vehicleProfileDraftSchema.safeParse(draft).success).toBe(true);
    expect(draft.vehicle.curbMassKg).toBeCloseTo(15 * 907.18474, 6);
    expect(draft.loadsKg).toEqual({ empty: 0, seated: expect.closeTo(2_267.96185, 6), 'full-standing': expect.closeTo(5_443.10844, 6) });
    expect(draft.vehicle.payloadKg).toBe(draft.loadsKg.seated);
    expect(draft.passengerMassKg).toBeCloseTo(165 * 0.45359237, 9);
    expect(draft.vehicle.maxTractionForceN).toBeCloseTo(8_000 * 4.4482216152605, 6);
    expect(draft.vehicle.regenMinSpeedMps).toBeCloseTo(3 * 0.44704, 9);
    expect(draft.seasons.winter.ambientC).toBeCloseTo(-15, 9);
    expect(draft.seasons.mild.ambientC).toBeCloseTo(10, 9);
    expect(draft.seasons.summer.ambientC).toBeCloseTo(30, 9);
    expect(draft.vehicle.tractionPowerW).toBe(250_000);
    expect(draft.vehicle.drivetrainEfficiency).toBeCloseTo(0.9, 9);
  });

  it('saves an untouched profile shown in imperial exactly as it was loaded', () => {
    const profile = aProfile();
    const basis = profileNumbersBasis(profile, 'imperial');

    const draft = toVehicleDraft(toVehicleFormValue(profile, 'imperial'), 'battery-bus-12m', 'imperial', basis);

    expect(draft.vehicle.curbMassKg).toBe(13_500);
    expect(draft.loadsKg).toEqual(profile.loadsKg);
    expect(draft.passengerMassKg).toBe(70);
    expect(draft.vehicle.regenMinSpeedMps).toBe(5 / 3.6);
    expect(draft.seasons).toEqual(profile.seasons);
  });

  it('converts the fields when units are switched and comes back to the same SI values', () => {
    const profile = aProfile();
    const loaded = profileNumbersBasis(profile, 'metric');

    const imperial = switchUnits(loaded.shown, 'metric', 'imperial', loaded);
    const metricAgain = switchUnits(imperial.shown, 'imperial', 'metric', imperial);

    expect(imperial.shown['curbMass']).toBe(14.88);
    expect(imperial.shown['winterAmbient']).toBe(14);
    expect(metricAgain.shown).toEqual(loaded.shown);
    const draft = toVehicleDraft(toVehicleFormValue(profile, 'metric'), 'battery-bus-12m', 'metric', metricAgain);
    expect(draft).toEqual(toVehicleDraft(toVehicleFormValue(profile, 'metric'), 'battery-bus-12m', 'metric', loaded));
    expect(draft.vehicle.curbMassKg).toBe(13_500);
  });

  it('carries a value typed in one system into the other without loss', () => {
    const loaded = profileNumbersBasis(aProfile(), 'imperial');
    const typed = { ...loaded.shown, curbMass: 16, passengerMass: 180 };

    const metric = switchUnits(typed, 'imperial', 'metric', loaded);
    const imperialAgain = switchUnits(metric.shown, 'metric', 'imperial', metric);

    expect(metric.shown['curbMass']).toBeCloseTo(14.514956, 6);
    expect(metric.si['passengerMass']).toBeCloseTo(180 * 0.45359237, 9);
    expect(imperialAgain.shown['curbMass']).toBe(16);
    expect(imperialAgain.shown['passengerMass']).toBe(180);
    expect(imperialAgain.si['curbMass']).toBeCloseTo(16 * 907.18474, 9);
  });

  it('keeps empty fields empty when units are switched', () => {
    const empty = Object.fromEntries(VEHICLE_FIELDS.map((candidate) => [candidate.key, null]));

    expect(Object.values(switchUnits(empty, 'metric', 'imperial').shown).every((value) => value === null)).toBe(true);
  });

  it('states the limits in the units shown, rounded inside the metric ones', () => {
    expect(fieldMessage(field('curbMass'), null, 'imperial')).toBe('Enter a value (0.12 to 220.46 tn).');
    expect(fieldMessage(field('passengerMass'), 300, 'imperial')).toBe('At most 264.55 lb.');
    expect(fieldMessage(field('winterAmbient'), -80, 'imperial')).toBe('At least -76 °F.');
    expect(fieldMessage(field('maxTractionForce'), 0, 'imperial')).toBe('Must be more than 0 lbf.');
    expect(fieldMessage(field('curbMass'), 220.46, 'imperial')).toBeNull();
  });
});

describe('battery ageing and cabin climate in the vehicle form', () => {
  it('shows the end-of-life fractions in percent, saves them in SI and leaves them unstated when empty', () => {
    const base = aProfile();
    const value = toVehicleFormValue(
      { ...base, vehicle: { ...base.vehicle, endOfLifeCapacityFraction: 0.75, endOfLifeChargePowerFraction: 0.9 } },
      'metric',
    );

    expect(value.numbers['endOfLifeCapacity']).toBe(75);
    expect(value.numbers['endOfLifeChargePower']).toBe(90);
    const draft = toVehicleDraft(value, 'battery-bus-12m', 'metric');
    expect(draft.vehicle).toMatchObject({ endOfLifeCapacityFraction: 0.75, endOfLifeChargePowerFraction: 0.9 });
    const emptied = toVehicleDraft({ ...value, numbers: { ...value.numbers, endOfLifeCapacity: null } }, 'battery-bus-12m', 'metric');
    expect(emptied.vehicle.endOfLifeCapacityFraction).toBeUndefined();
    expect(fieldMessage(field('endOfLifeCapacity'), 20, 'metric')).toBe('At least 30 %.');
  });

  it('states the default an empty optional field stands for, and the range, in the hint', () => {
    expect(fieldHint(field('endOfLifeCapacity'), 'metric')).toMatch(/Empty: 80 %\. From 30 to 100 %\.$/);
    expect(fieldHint(field('heatingSetpoint'), 'metric')).toBe(`Empty: ${DEFAULT_CLIMATE.heatingSetpointC} °C. From 5 to 30 °C.`);
    expect(fieldHint(field('heatingSetpoint'), 'imperial')).toBe('Empty: 64.4 °F. From 41 to 86 °F.');
    expect(fieldHint(field('rearBrakeThermalMassShare'), 'metric')).toMatch(/Above 0, below 100 %\.$/);
    expect(fieldHint(field('tractionPower'), 'metric')).toBe('At the wheel. Above 0, up to 5000 kW.');
  });

  it('saves no climate while it is switched off, and only the stated climate fields when on', () => {
    const value = toVehicleFormValue(aProfile(), 'metric');
    expect(value.climateEnabled).toBe(false);
    expect(toVehicleDraft(value, 'battery-bus-12m', 'metric').climate).toBeNull();

    const on = {
      ...value,
      climateEnabled: true,
      numbers: { ...value.numbers, heatingSetpoint: 16, baseLoad: 2.5, preconditioning: 20, heatPumpHeat: 0 },
      copPoints: [],
    };
    const draft = toVehicleDraft(on, 'battery-bus-12m', 'metric');

    expect(draft.climate).toEqual({ heatingSetpointC: 16, baseLoadW: 2_500, preconditioningS: 1_200, heatPumpHeatW: 0 });
    expect(vehicleProfileDraftSchema.safeParse(draft).success).toBe(true);
  });

  it('reads a stored climate with its COP curve back into the form, in °F too, and saves it unchanged', () => {
    const climate = {
      heatingSetpointC: 17,
      bodyUaWPerK: 420,
      heatPumpCop: [
        { ambientC: -15, cop: 1.5 },
        { ambientC: 5, cop: 2.6 },
      ],
    };
    const profile = { ...aProfile(), climate };

    const metric = toVehicleFormValue(profile, 'metric');
    expect(metric.climateEnabled).toBe(true);
    expect(metric.numbers['bodyUa']).toBe(420);
    expect(metric.numbers['freshAir']).toBeNull();
    expect(metric.copPoints).toEqual([
      { ambient: -15, cop: 1.5 },
      { ambient: 5, cop: 2.6 },
    ]);
    expect(toVehicleDraft(metric, 'battery-bus-12m', 'metric').climate).toEqual(climate);

    const imperial = toVehicleFormValue(profile, 'imperial');
    expect(imperial.copPoints.map((point) => point.ambient)).toEqual([5, 41]);
    expect(toVehicleDraft(imperial, 'battery-bus-12m', 'imperial', profileNumbersBasis(profile, 'imperial')).climate).toEqual(climate);
  });

  it('names what is wrong with the COP test points', () => {
    expect(
      copPointsMessage(
        [
          { ambient: -10, cop: 1.8 },
          { ambient: -10, cop: 2 },
        ],
        'metric',
      ),
    ).toBe('Test point 2: temperatures must rise from row to row.');
    expect(copPointsMessage([{ ambient: -10, cop: null }], 'metric')).toBe('Test point 1: enter both the temperature and the COP.');
    expect(copPointsMessage([{ ambient: -50, cop: 2 }], 'metric')).toBe('Test point 1: the temperature must be -40 to 40 °C.');
    expect(copPointsMessage([{ ambient: 0, cop: 9 }], 'metric')).toBe('Test point 1: the COP must be 1 to 8.');
    expect(copPointsMessage(defaultCopPoints('metric'), 'metric')).toBeNull();
    expect(copPointsMessage(defaultCopPoints('imperial'), 'imperial')).toBeNull();
  });
});

describe('one source for the vehicle limits: the form accepts exactly what the contract accepts', () => {
  const drafts = (key: string, si: number) => {
    const profile = aProfile();
    const value = toVehicleFormValue(profile, 'metric');
    const chosen = field(key);
    const withValue = {
      ...value,
      climateEnabled: isClimateField(chosen),
      numbers: { ...value.numbers, [key]: si / chosen.factor },
    };
    return toVehicleDraft(withValue, 'battery-bus-12m', 'metric');
  };

  // Every field whose range is its own (cross-field rules aside), checked at and just beyond both bounds.
  // The permissible gross mass is also tied to the loads; the SOC pair and battery energy to each other.
  const skip = new Set([
    'permissibleGrossMass',
    'socTaperStart',
    'socCeiling',
    'regenContinuousPower',
    'batteryCapacity',
    'loadSeated',
    'loadFull',
    'loadEmpty',
  ]);
  for (const candidate of VEHICLE_FIELDS.filter((f) => !skip.has(f.key))) {
    it(`${candidate.key}: the form's message and the contract agree at ${candidate.min} and ${candidate.max} ${candidate.unit}`, () => {
      const span = candidate.max - candidate.min;
      for (const shown of [candidate.min, candidate.max, candidate.min - span * 1e-3, candidate.max + span * 1e-3]) {
        const formAccepts = fieldMessage(candidate, shown, 'metric') === null;
        const draft = drafts(candidate.key, shown * candidate.factor);
        const parsed = isClimateField(candidate)
          ? climateSettingsSchema.safeParse(draft.climate)
          : candidate.group === 'Auxiliary loads by season' || candidate.key === 'passengerMass'
            ? vehicleProfileDraftSchema.safeParse(draft)
            : vehicleSchema.safeParse(draft.vehicle);
        expect({ shown, accepted: parsed.success }).toEqual({ shown, accepted: formAccepts });
      }
    });
  }
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

describe('percentages shown (issue 10: an efficiency read "86.233 %")', () => {
  it('shows an efficiency to the field’s step and still saves the exact value when left as shown', () => {
    const field = VEHICLE_FIELDS.find((candidate) => candidate.key === 'drivetrainEfficiency')!;

    expect(toShownNumber(field, 0.889 * 0.97, 'metric')).toBe(86.2);
  });
});
