/**
 * The vehicle-profile form: every engine parameter with its group, label, displayed unit, the
 * factor between that unit and SI, its limits and the message shown when a value breaks them.
 * Masses, forces, speeds, temperatures, areas and the brakes' thermal mass follow the
 * metric/imperial choice through unit-format; everything else (power and energy in kW/kWh,
 * coefficients, percentages) reads the same in both. Pure data and functions, so the mapping and the messages are tested without a browser.
 */
import type { RetarderType } from '@shared/domain/analysis';
import { CLIMATE_LIMITS as C, COP_POINTS, VEHICLE_LIMITS as L, type NumberRange } from '@shared/domain/limits';
import type { ClimateSettingsInput, VehicleProfileDraftInput } from '@shared/domain/vehicle-profiles';
import { DEFAULT_CLIMATE, DEFAULT_END_OF_LIFE_CAPACITY_FRACTION } from '@shared/engine/constants';
import { kphToMps } from '@shared/presentation/units';
import { fromDisplay, toDisplay, unitLabel, type Quantity, type UnitSystem } from '../units/unit-format';

export const VEHICLE_FIELD_GROUPS = [
  'Mass and load',
  'Aerodynamics and tyres',
  'Powertrain',
  'Battery and regeneration limits',
  'Auxiliary loads by season',
  'Brakes and retarder',
  'Overhead-line receptivity',
  'Cabin climate (service days)',
] as const;
export type VehicleFieldGroup = (typeof VEHICLE_FIELD_GROUPS)[number];

export interface VehicleField {
  /** Form control name. */
  key: string;
  group: VehicleFieldGroup;
  label: string;
  /** Metric unit shown beside the value ('' for plain numbers). */
  unit: string;
  /** SI value = metric displayed value × factor. */
  factor: number;
  /** When set, the imperial display converts through unit-format as this kind of quantity. */
  quantity?: Quantity;
  /**
   * Limits in the metric displayed unit (see `fieldLimits` for the imperial ones), converted from
   * the contract's SI ranges in shared/domain/limits.ts so the form accepts what the API accepts.
   */
  min: number;
  max: number;
  /** Whether the minimum itself is refused (e.g. efficiencies must be above 0). */
  minExclusive?: boolean;
  /** Whether the maximum itself is refused (e.g. the rear share of brake mass must leave some for the front). */
  maxExclusive?: boolean;
  step: number;
  hint?: string;
  /** Whether the field may stay empty (the profile then does not state it). */
  optional?: boolean;
  /** SI value the engine takes when an optional field is left empty (shown in the hint). */
  defaultSi?: number;
  /** Cabin-climate fields: the key in the profile's `climate`. */
  climateKey?: Exclude<keyof ClimateSettingsInput, 'heatPumpCop'>;
  /** Reads the SI value from a profile (null: not stated). */
  read: (profile: VehicleProfileDraftInput) => number | null;
}

const v = (profile: VehicleProfileDraftInput) => profile.vehicle;

/** A contract range (SI) in the metric displayed unit: SI ÷ factor, rounded off float noise. */
function shownLimits(range: NumberRange, factor: number): Pick<VehicleField, 'min' | 'max' | 'minExclusive' | 'maxExclusive'> {
  const shown = (si: number) => roundTo(si / factor, 6);
  return {
    min: shown(range.min),
    max: shown(range.max),
    ...(range.minExclusive ? { minExclusive: true } : {}),
    ...(range.maxExclusive ? { maxExclusive: true } : {}),
  };
}

/** How a field is shown: its metric unit, the factor from that unit to SI, and the quantity that converts it for imperial. */
type ShownUnit = Pick<VehicleField, 'unit' | 'factor' | 'quantity'>;

const PLAIN: ShownUnit = { unit: '', factor: 1 };
const TONNES: ShownUnit = { unit: 't', factor: 1_000, quantity: 'mass' };
const KILOGRAMS: ShownUnit = { unit: 'kg', factor: 1, quantity: 'lightMass' };
const SQUARE_METRES: ShownUnit = { unit: 'm²', factor: 1, quantity: 'area' };
const KILONEWTONS: ShownUnit = { unit: 'kN', factor: 1_000, quantity: 'force' };
const KM_PER_HOUR: ShownUnit = { unit: 'km/h', factor: kphToMps(1), quantity: 'speed' };
const CELSIUS: ShownUnit = { unit: '°C', factor: 1, quantity: 'temperature' };
const KILOJOULES_PER_KELVIN: ShownUnit = { unit: 'kJ/K', factor: 1_000, quantity: 'heatCapacity' };
const KILOWATTS: ShownUnit = { unit: 'kW', factor: 1_000 };
const KILOWATT_HOURS: ShownUnit = { unit: 'kWh', factor: 1_000 };
const PERCENT: ShownUnit = { unit: '%', factor: 0.01 };
const SOC_PERCENT: ShownUnit = { unit: '% SOC', factor: 0.01 };
const SECONDS: ShownUnit = { unit: 's', factor: 1 };
const MINUTES: ShownUnit = { unit: 'min', factor: 60 };
const WATTS_PER_KELVIN: ShownUnit = { unit: 'W/K', factor: 1 };
const CUBIC_METRES_PER_HOUR: ShownUnit = { unit: 'm³/h', factor: 1 };
const CUBIC_METRES: ShownUnit = { unit: 'm³', factor: 1 };

/** What a field states beyond its group and shown unit: its limits come from the contract range `range`. */
type FieldSpec = Pick<VehicleField, 'key' | 'label' | 'step' | 'hint' | 'optional' | 'defaultSi' | 'climateKey' | 'read'> & {
  shown: ShownUnit;
  range: NumberRange;
};

/** The fields of one group, each with its limits in the shown unit. */
function fieldGroup(group: VehicleFieldGroup, specs: readonly FieldSpec[]): VehicleField[] {
  return specs.map(({ shown, range, ...spec }) => ({ ...spec, group, ...shown, ...shownLimits(range, shown.factor) }));
}

/** The cabin-climate fields: optional, each defaulting to the engine's value and read from the profile's `climate`. */
function climateFields(
  specs: readonly (Omit<FieldSpec, 'read' | 'optional' | 'defaultSi' | 'climateKey'> & {
    climateKey: NonNullable<VehicleField['climateKey']>;
  })[],
): VehicleField[] {
  return fieldGroup(
    'Cabin climate (service days)',
    specs.map((spec) => ({
      ...spec,
      optional: true,
      defaultSi: DEFAULT_CLIMATE[spec.climateKey],
      read: (p: VehicleProfileDraftInput) => p.climate?.[spec.climateKey] ?? null,
    })),
  );
}

export const VEHICLE_FIELDS: readonly VehicleField[] = [
  ...fieldGroup('Mass and load', [
    {
      key: 'curbMass',
      label: 'Curb mass',
      shown: TONNES,
      range: L.curbMassKg,
      step: 0.1,
      hint: 'Empty vehicle ready for service.',
      read: (p) => v(p).curbMassKg,
    },
    { key: 'loadEmpty', label: 'Payload, empty', shown: TONNES, range: L.payloadKg, step: 0.1, read: (p) => p.loadsKg.empty },
    { key: 'loadSeated', label: 'Payload, seated', shown: TONNES, range: L.payloadKg, step: 0.1, read: (p) => p.loadsKg.seated },
    {
      key: 'loadFull',
      label: 'Payload, full standing',
      shown: TONNES,
      range: L.payloadKg,
      step: 0.1,
      read: (p) => p.loadsKg['full-standing'],
    },
    {
      key: 'permissibleGrossMass',
      label: 'Permissible gross mass',
      shown: TONNES,
      range: L.permissibleGrossMassKg,
      step: 0.1,
      optional: true,
      hint: 'From the vehicle maker or registration papers; the worst case uses it. Leave empty if not known.',
      read: (p) => v(p).permissibleGrossMassKg ?? null,
    },
    {
      key: 'passengerMass',
      label: 'Mass per passenger',
      shown: KILOGRAMS,
      range: L.passengerMassKg,
      step: 1,
      hint: 'Used when a scenario gives a passenger count.',
      read: (p) => p.passengerMassKg ?? 70,
    },
    {
      key: 'rotatingMassFactor',
      label: 'Rotating-mass factor',
      shown: PLAIN,
      range: L.rotatingMassFactor,
      step: 0.01,
      hint: 'Inertia = (1 + factor) · m · a.',
      read: (p) => v(p).rotatingMassFactor,
    },
  ]),
  ...fieldGroup('Aerodynamics and tyres', [
    { key: 'frontalArea', label: 'Frontal area', shown: SQUARE_METRES, range: L.frontalAreaM2, step: 0.1, read: (p) => v(p).frontalAreaM2 },
    {
      key: 'dragCoefficient',
      label: 'Drag coefficient',
      shown: PLAIN,
      range: L.dragCoefficient,
      step: 0.01,
      read: (p) => v(p).dragCoefficient,
    },
    {
      key: 'rollingResistance',
      label: 'Rolling resistance coefficient',
      shown: PLAIN,
      range: L.rollingResistanceCoefficient,
      step: 0.001,
      read: (p) => v(p).rollingResistanceCoefficient,
    },
  ]),
  ...fieldGroup('Powertrain', [
    {
      key: 'tractionPower',
      label: 'Peak traction power',
      shown: KILOWATTS,
      range: L.tractionPowerW,
      step: 1,
      hint: 'At the wheel.',
      read: (p) => v(p).tractionPowerW,
    },
    {
      key: 'regenPower',
      label: 'Peak regenerative power',
      shown: KILOWATTS,
      range: L.regenPowerW,
      step: 1,
      hint: '0 means no regeneration at all.',
      read: (p) => v(p).regenPowerW,
    },
    {
      key: 'maxTractionForce',
      label: 'Tractive force limit',
      shown: KILONEWTONS,
      range: L.maxTractionForceN,
      step: 0.5,
      hint: 'Motor torque at the wheel; also caps the regen force.',
      read: (p) => v(p).maxTractionForceN ?? 35_000,
    },
    {
      key: 'drivetrainEfficiency',
      label: 'Drivetrain efficiency',
      shown: PERCENT,
      range: L.efficiency,
      step: 0.1,
      hint: 'Battery (or line) → wheel while motoring.',
      read: (p) => v(p).drivetrainEfficiency,
    },
    {
      key: 'regenContinuousPower',
      label: 'Continuous regenerative power',
      shown: KILOWATTS,
      range: L.regenContinuousPowerW,
      step: 1,
      optional: true,
      hint: 'What the machine can hold indefinitely. Empty: the peak power is held.',
      read: (p) => v(p).regenContinuousPowerW ?? null,
    },
    {
      key: 'regenPeakHold',
      label: 'Peak regeneration held for',
      shown: SECONDS,
      range: L.regenPeakHoldS,
      step: 1,
      hint: 'After this the continuous power applies.',
      read: (p) => v(p).regenPeakHoldS ?? 60,
    },
    {
      key: 'drivenAxleLoadShare',
      label: 'Weight on the driven axles',
      shown: PERCENT,
      range: L.share,
      step: 1,
      hint: 'Grip on these axles caps regeneration.',
      read: (p) => v(p).drivenAxleLoadShare ?? 0.6,
    },
    {
      key: 'regenEfficiency',
      label: 'Regeneration efficiency',
      shown: PERCENT,
      range: L.efficiency,
      step: 0.1,
      hint: 'Wheel → battery (or line) while braking.',
      read: (p) => v(p).regenEfficiency,
    },
  ]),
  ...fieldGroup('Battery and regeneration limits', [
    {
      key: 'batteryCapacity',
      label: 'Usable battery energy',
      shown: KILOWATT_HOURS,
      range: L.batteryCapacityWh,
      step: 1,
      hint: 'May be 0 for an overhead-line vehicle without storage.',
      read: (p) => v(p).batteryCapacityWh,
    },
    {
      key: 'maxChargePower',
      label: 'Charge-power limit',
      shown: KILOWATTS,
      range: L.maxChargePowerW,
      step: 1,
      read: (p) => v(p).maxChargePowerW,
    },
    {
      key: 'socTaperStart',
      label: 'Charge limit starts falling at',
      shown: SOC_PERCENT,
      range: L.share,
      step: 1,
      read: (p) => v(p).socTaperStart ?? 0.85,
    },
    { key: 'socCeiling', label: 'No charging above', shown: SOC_PERCENT, range: L.share, step: 1, read: (p) => v(p).socCeiling ?? 0.95 },
    {
      key: 'regenMinSpeed',
      label: 'Regeneration fades out below',
      shown: KM_PER_HOUR,
      range: L.regenMinSpeedMps,
      step: 0.5,
      hint: 'Below this speed regeneration falls linearly to nothing at standstill; the friction brakes take the rest.',
      read: (p) => v(p).regenMinSpeedMps ?? kphToMps(5),
    },
    {
      key: 'coldChargeFullFrom',
      label: 'Full charge power from',
      shown: CELSIUS,
      range: L.coldChargeFullFromC,
      step: 1,
      hint: 'Ambient temperature; below it the charge-power limit falls towards its share at −20 °C.',
      read: (p) => v(p).coldChargeFullFromC ?? 10,
    },
    {
      key: 'coldChargeShare',
      label: 'Charge power left at −20 °C (−4 °F)',
      shown: PERCENT,
      range: L.share,
      step: 1,
      hint: "100 for a pack kept warm. Take it from the maker's charging limits for cold cells.",
      read: (p) => v(p).coldChargeShareAtMinus20C ?? 1,
    },
    {
      key: 'endOfLifeCapacity',
      label: 'Usable energy left at end of life',
      shown: PERCENT,
      range: L.endOfLifeFraction,
      step: 1,
      optional: true,
      defaultSi: DEFAULT_END_OF_LIFE_CAPACITY_FRACTION,
      hint: "Of the new battery's usable energy; service days checked at end of life use it. Take it from the maker's warranty.",
      read: (p) => v(p).endOfLifeCapacityFraction ?? null,
    },
    {
      key: 'endOfLifeChargePower',
      label: 'Charge power left at end of life',
      shown: PERCENT,
      range: L.endOfLifeFraction,
      step: 1,
      optional: true,
      defaultSi: 1,
      hint: "Of the new battery's charge-power limit, for service days at end of life.",
      read: (p) => v(p).endOfLifeChargePowerFraction ?? null,
    },
  ]),
  ...fieldGroup(
    'Auxiliary loads by season',
    (['winter', 'mild', 'summer'] as const).flatMap((season): FieldSpec[] => {
      const name = season.charAt(0).toUpperCase() + season.slice(1);
      const seasonOf = (p: VehicleProfileDraftInput) => p.seasons[season];
      return [
        {
          key: `${season}Ambient`,
          label: `${name} ambient`,
          shown: CELSIUS,
          range: L.ambientC,
          step: 1,
          read: (p) => seasonOf(p).ambientC,
        },
        {
          key: `${season}Aux`,
          label: `${name} auxiliary power`,
          shown: KILOWATTS,
          range: L.auxPowerW,
          step: 0.5,
          read: (p) => seasonOf(p).auxPowerW,
        },
      ];
    }),
  ),
  ...fieldGroup('Brakes and retarder', [
    {
      key: 'brakeThermalMass',
      label: 'Brake thermal mass',
      shown: KILOJOULES_PER_KELVIN,
      range: L.brakeThermalMassJPerK,
      step: 1,
      hint: 'All discs or drums with hubs together.',
      read: (p) => v(p).brakeThermalMassJPerK ?? 92_000,
    },
    {
      key: 'brakeCoolingArea',
      label: 'Brake cooling area',
      shown: SQUARE_METRES,
      range: L.brakeCoolingAreaM2,
      step: 0.1,
      read: (p) => v(p).brakeCoolingAreaM2 ?? 1.6,
    },
    {
      key: 'brakeHeatShare',
      label: 'Heat into discs or drums',
      shown: PERCENT,
      range: L.share,
      step: 1,
      read: (p) => v(p).brakeHeatShare ?? 0.95,
    },
    {
      key: 'brakeEmissivity',
      label: 'Brake surface emissivity',
      shown: PLAIN,
      range: L.share,
      step: 0.05,
      read: (p) => v(p).brakeEmissivity ?? 0.6,
    },
    {
      key: 'rearBrakeShare',
      label: 'Rear share of braking',
      shown: PERCENT,
      range: L.share,
      step: 1,
      hint: 'Share of the friction braking force at the rear; the rest is at the front.',
      read: (p) => v(p).rearBrakeShare ?? 0.6,
    },
    {
      key: 'rearBrakeThermalMassShare',
      label: 'Rear share of brake mass',
      shown: PERCENT,
      range: L.rearBrakeThermalMassShare,
      step: 1,
      hint: 'Of the brakes’ thermal mass and cooled surface.',
      read: (p) => v(p).rearBrakeThermalMassShare ?? 0.5,
    },
    {
      key: 'retarderPower',
      label: 'Retarder or braking-resistor power',
      shown: KILOWATTS,
      range: L.retarderPowerW,
      step: 1,
      hint: '0 when the vehicle has none.',
      read: (p) => v(p).retarderPowerW ?? 0,
    },
  ]),
  ...fieldGroup('Overhead-line receptivity', [
    {
      key: 'lineReceptivity',
      label: 'Line receptivity',
      shown: PERCENT,
      range: L.share,
      step: 1,
      hint: 'Share of regenerated power another vehicle on the line can take.',
      read: (p) => v(p).lineReceptivity ?? 0.5,
    },
  ]),
  ...climateFields([
    {
      key: 'heatingSetpoint',
      label: 'Cabin heated to',
      shown: CELSIUS,
      range: C.heatingSetpointC,
      step: 0.5,
      climateKey: 'heatingSetpointC',
    },
    {
      key: 'coolingSetpoint',
      label: 'Cabin cooled to',
      shown: CELSIUS,
      range: C.coolingSetpointC,
      step: 0.5,
      climateKey: 'coolingSetpointC',
    },
    {
      key: 'bodyUa',
      label: 'Body heat loss',
      shown: WATTS_PER_KELVIN,
      range: C.bodyUaWPerK,
      step: 10,
      hint: 'Through walls, roof, floor and glazing per kelvin between cabin and outside.',
      climateKey: 'bodyUaWPerK',
    },
    {
      key: 'freshAir',
      label: 'Fresh air',
      shown: CUBIC_METRES_PER_HOUR,
      range: C.freshAirM3PerH,
      step: 10,
      hint: 'Outside air the ventilation takes in; it is heated or cooled to the cabin temperature.',
      climateKey: 'freshAirM3PerH',
    },
    {
      key: 'doorAirExchange',
      label: 'Door air exchange',
      shown: CUBIC_METRES,
      range: C.doorAirExchangeM3,
      step: 0.5,
      hint: 'Air swapped at each stop with all doors open.',
      climateKey: 'doorAirExchangeM3',
    },
    {
      key: 'baseLoad',
      label: 'Base load',
      shown: KILOWATTS,
      range: C.baseLoadW,
      step: 0.1,
      hint: 'Fans, lighting, electronics, compressors: drawn all the time.',
      climateKey: 'baseLoadW',
    },
    {
      key: 'heatPumpHeat',
      label: 'Heat-pump heat output',
      shown: KILOWATTS,
      range: C.heatPumpHeatW,
      step: 0.5,
      hint: '0: no heat pump, resistive heating only.',
      climateKey: 'heatPumpHeatW',
    },
    {
      key: 'heatPumpMinAmbient',
      label: 'Heat pump runs down to',
      shown: CELSIUS,
      range: C.heatPumpMinAmbientC,
      step: 1,
      hint: 'Ambient; below it the resistive back-up heats alone.',
      climateKey: 'heatPumpMinAmbientC',
    },
    {
      key: 'coolingEer',
      label: 'Cooling EER',
      shown: PLAIN,
      range: C.coolingEer,
      step: 0.1,
      hint: 'Cooling efficiency: heat removed ÷ electrical power.',
      climateKey: 'coolingEer',
    },
    {
      key: 'preconditioning',
      label: 'Pre-conditioning',
      shown: MINUTES,
      range: C.preconditioningS,
      step: 1,
      hint: 'At the depot before pull-out, on depot power.',
      climateKey: 'preconditioningS',
    },
    {
      key: 'cabinHeatCapacity',
      label: 'Cabin heat mass',
      shown: KILOJOULES_PER_KELVIN,
      range: C.cabinHeatCapacityJPerK,
      step: 10,
      hint: 'Heat capacity of the air and fittings warmed by pre-conditioning.',
      climateKey: 'cabinHeatCapacityJPerK',
    },
  ]),
];

export type VehicleNumbers = Record<string, number | null>;

export interface VehicleFormValue {
  name: string;
  description: string;
  powerSource: 'battery' | 'overhead-line';
  brakeType: 'disc' | 'drum';
  retarderType: RetarderType;
  numbers: VehicleNumbers;
  /** Whether service days model the cabin climate (off: the season's constant auxiliary power). */
  climateEnabled: boolean;
  /** The heat pump's COP test points as shown (ambient in the chosen temperature unit); none: the engine's curve. */
  copPoints: CopPoint[];
}

/** One test point of the heat pump's COP curve as the form shows it. */
export interface CopPoint {
  ambient: number | null;
  cop: number | null;
}

/** Whether a field is one of the cabin-climate fields (only read while the climate is modelled). */
export function isClimateField(field: VehicleField): boolean {
  return field.climateKey !== undefined;
}

/** Words for each kind of endurance brake. */
export const RETARDER_TYPE_LABELS: Readonly<Record<RetarderType, string>> = {
  none: 'None',
  'braking-resistor': 'Braking resistor (through the motor)',
  hydrodynamic: 'Hydrodynamic retarder',
  'eddy-current': 'Eddy-current retarder',
};

/** SI value of each number field, keyed like the form controls (null while a field is empty). */
export type VehicleSiNumbers = Record<string, number | null>;

/**
 * Numbers as shown in one unit system, with the SI values they were rounded from. Saving or
 * switching units starts from the SI value of every field the person has not changed since, so
 * display rounding never accumulates and an untouched profile saves exactly as it was loaded.
 */
export interface VehicleNumbersBasis {
  system: UnitSystem;
  shown: VehicleNumbers;
  si: VehicleSiNumbers;
}

/** Unit shown beside a field in the chosen system. */
export function fieldUnit(field: VehicleField, system: UnitSystem): string {
  return system === 'imperial' && field.quantity ? unitLabel(field.quantity, system) : field.unit;
}

/**
 * The displayed number for an SI value, rounded to what a person would type: metric values are
 * the stored ones (percentages to their field's step); converted imperial values keep two
 * decimals (three below 10). A value left as
 * shown still saves its exact SI value (see toSiNumbers).
 */
export function toShownNumber(field: VehicleField, si: number, system: UnitSystem): number {
  if (system === 'imperial' && field.quantity) {
    const shown = toDisplay(field.quantity, si, system);
    return roundTo(shown, Math.abs(shown) < 10 ? 3 : 2);
  }
  // Percentages read to the field's step (an efficiency of 0.86233 shows 86.2 %, not 86.233 %);
  // other metric values are the stored ones.
  return roundTo(si / field.factor, field.unit === '%' ? stepDecimals(field.step) : 6);
}

function stepDecimals(step: number): number {
  return Math.max(0, Math.ceil(-Math.log10(step) - 1e-9));
}

/** The SI value of a displayed number. */
export function toSiNumber(field: VehicleField, shown: number, system: UnitSystem): number {
  const si = system === 'imperial' && field.quantity ? fromDisplay(field.quantity, shown, system) : shown * field.factor;
  return roundTo(si, 9);
}

/**
 * A field's limits in the chosen system. Imperial limits are the metric ones converted and rounded
 * inwards to two decimals, so every value accepted here is inside the metric limits too.
 */
export function fieldLimits(field: VehicleField, system: UnitSystem): { min: number; max: number } {
  const quantity = field.quantity;
  if (system === 'metric' || !quantity) return { min: field.min, max: field.max };
  const shown = (metric: number) => toDisplay(quantity, metric * field.factor, system) * 100;
  return { min: Math.ceil(shown(field.min) - 1e-6) / 100 || 0, max: Math.floor(shown(field.max) + 1e-6) / 100 || 0 };
}

/** The SI values of a profile's number fields and how they read in `system`. */
export function profileNumbersBasis(profile: VehicleProfileDraftInput, system: UnitSystem): VehicleNumbersBasis {
  const si: VehicleSiNumbers = {};
  for (const field of VEHICLE_FIELDS) si[field.key] = field.read(profile);
  return { system, si, shown: toShownNumbers(si, system) };
}

/** Displayed values of a profile in `system`. */
export function toVehicleFormValue(profile: VehicleProfileDraftInput, system: UnitSystem): VehicleFormValue {
  return {
    name: profile.name,
    description: profile.description ?? '',
    powerSource: profile.vehicle.powerSource ?? 'battery',
    brakeType: profile.vehicle.brakeType ?? 'disc',
    // An unstated kind reads as the engine reads it: a braking resistor when there is retarder power.
    retarderType: profile.vehicle.retarderType ?? ((profile.vehicle.retarderPowerW ?? 0) > 0 ? 'braking-resistor' : 'none'),
    numbers: profileNumbersBasis(profile, system).shown,
    climateEnabled: profile.climate !== null && profile.climate !== undefined,
    copPoints: (profile.climate?.heatPumpCop ?? []).map((point) => ({
      ambient: toShownTemperature(point.ambientC, system),
      cop: point.cop,
    })),
  };
}

/** An ambient temperature (°C) as a COP row shows it. */
export function toShownTemperature(celsius: number, system: UnitSystem): number {
  return roundTo(toDisplay('temperature', celsius, system), 2);
}

/** A COP row's shown temperature in °C. */
export function toCelsius(shown: number, system: UnitSystem): number {
  return roundTo(fromDisplay('temperature', shown, system), 2);
}

/** The engine's COP curve when a profile states none, as the form lists it. */
export function defaultCopPoints(system: UnitSystem): CopPoint[] {
  return DEFAULT_CLIMATE.heatPumpCop.map((point) => ({ ambient: toShownTemperature(point.ambientC, system), cop: point.cop }));
}

/**
 * What is wrong with the COP rows, or null: each row needs a temperature and a COP within the
 * contract's ranges, the temperatures must ascend, and there may be at most the contract's count.
 */
export function copPointsMessage(points: readonly CopPoint[], system: UnitSystem): string | null {
  if (points.length > COP_POINTS.max) return `At most ${COP_POINTS.max} test points.`;
  const unit = unitLabel('temperature', system);
  const low = Math.ceil(toDisplay('temperature', C.copAmbientC.min, system) - 1e-9);
  const high = Math.floor(toDisplay('temperature', C.copAmbientC.max, system) + 1e-9);
  for (const [index, point] of points.entries()) {
    const row = `Test point ${index + 1}`;
    if (point.ambient === null || Number.isNaN(point.ambient) || point.cop === null || Number.isNaN(point.cop)) {
      return `${row}: enter both the temperature and the COP.`;
    }
    if (point.ambient < low || point.ambient > high) return `${row}: the temperature must be ${low} to ${high} ${unit}.`;
    if (point.cop < C.cop.min || point.cop > C.cop.max) return `${row}: the COP must be ${C.cop.min} to ${C.cop.max}.`;
    const before = points[index - 1];
    if (before && before.ambient !== null && point.ambient <= before.ambient) {
      return `${row}: temperatures must rise from row to row.`;
    }
  }
  return null;
}

/** The hint under a field: what it means, what an empty optional field stands for, and its range. */
export function fieldHint(field: VehicleField, system: UnitSystem): string {
  const unit = fieldUnit(field, system);
  const suffix = unit ? ` ${unit}` : '';
  const parts: string[] = [];
  if (field.hint) parts.push(field.hint);
  if (field.optional && field.defaultSi !== undefined) parts.push(`Empty: ${toShownNumber(field, field.defaultSi, system)}${suffix}.`);
  const { min, max } = fieldLimits(field, system);
  const upper = field.maxExclusive ? `below ${max}` : `up to ${max}`;
  parts.push(
    field.minExclusive
      ? `Above ${min}, ${upper}${suffix}.`
      : field.maxExclusive
        ? `From ${min}, ${upper}${suffix}.`
        : `From ${min} to ${max}${suffix}.`,
  );
  return parts.join(' ');
}

/**
 * SI values of the shown numbers: a field still showing what `basis` showed keeps the basis's SI
 * value; any other is converted from what was typed.
 */
export function toSiNumbers(shown: VehicleNumbers, system: UnitSystem, basis?: VehicleNumbersBasis | null): VehicleSiNumbers {
  const si: VehicleSiNumbers = {};
  for (const field of VEHICLE_FIELDS) {
    const value = shown[field.key];
    const kept = basis?.system === system && basis.shown[field.key] === value ? basis.si[field.key] : null;
    if (value === null || value === undefined || Number.isNaN(value)) si[field.key] = null;
    else si[field.key] = kept ?? toSiNumber(field, value, system);
  }
  return si;
}

/** The numbers to show for SI values in `system` (empty fields stay empty). */
export function toShownNumbers(si: VehicleSiNumbers, system: UnitSystem): VehicleNumbers {
  const shown: VehicleNumbers = {};
  for (const field of VEHICLE_FIELDS) {
    const value = si[field.key];
    shown[field.key] = value === null || value === undefined ? null : toShownNumber(field, value, system);
  }
  return shown;
}

/** The form's numbers re-expressed after the person switches units, with the new basis. */
export function switchUnits(
  shown: VehicleNumbers,
  from: UnitSystem,
  to: UnitSystem,
  basis?: VehicleNumbersBasis | null,
): VehicleNumbersBasis {
  const si = toSiNumbers(shown, from, basis);
  return { system: to, si, shown: toShownNumbers(si, to) };
}

/** The request body for POST/PUT /api/vehicles, in SI, from a form shown in `system`. */
export function toVehicleDraft(
  value: VehicleFormValue,
  vehicleClass: string,
  system: UnitSystem,
  basis?: VehicleNumbersBasis | null,
): VehicleProfileDraftInput {
  const numbers = toSiNumbers(value.numbers, system, basis);
  const si = (key: string) => {
    const found = numbers[key];
    if (found === null || found === undefined) throw new RangeError(`Missing value for ${key}`);
    return found;
  };
  const stated = (key: string) => numbers[key] ?? undefined;
  const seasons = {
    winter: { ambientC: si('winterAmbient'), auxPowerW: si('winterAux') },
    mild: { ambientC: si('mildAmbient'), auxPowerW: si('mildAux') },
    summer: { ambientC: si('summerAmbient'), auxPowerW: si('summerAux') },
  };
  const loadsKg = { empty: si('loadEmpty'), seated: si('loadSeated'), 'full-standing': si('loadFull') };
  let climate: ClimateSettingsInput | null = null;
  if (value.climateEnabled) {
    climate = {};
    for (const field of VEHICLE_FIELDS) {
      const stated = numbers[field.key];
      if (field.climateKey && stated !== null && stated !== undefined) climate[field.climateKey] = stated;
    }
    const points = value.copPoints.filter((point) => point.ambient !== null && point.cop !== null);
    if (points.length > 0) climate.heatPumpCop = points.map((point) => ({ ambientC: toCelsius(point.ambient!, system), cop: point.cop! }));
  }
  return {
    name: value.name.trim(),
    description: value.description.trim(),
    vehicleClass,
    passengerMassKg: si('passengerMass'),
    loadsKg,
    seasons,
    climate,
    vehicle: {
      curbMassKg: si('curbMass'),
      // The scenario's load case and season replace these two; the seated, mild values are the reference.
      payloadKg: loadsKg.seated,
      auxPowerW: seasons.mild.auxPowerW,
      frontalAreaM2: si('frontalArea'),
      dragCoefficient: si('dragCoefficient'),
      rollingResistanceCoefficient: si('rollingResistance'),
      rotatingMassFactor: si('rotatingMassFactor'),
      tractionPowerW: si('tractionPower'),
      regenPowerW: si('regenPower'),
      maxTractionForceN: si('maxTractionForce'),
      drivetrainEfficiency: si('drivetrainEfficiency'),
      regenEfficiency: si('regenEfficiency'),
      batteryCapacityWh: si('batteryCapacity'),
      maxChargePowerW: si('maxChargePower'),
      socTaperStart: si('socTaperStart'),
      socCeiling: si('socCeiling'),
      regenMinSpeedMps: si('regenMinSpeed'),
      coldChargeFullFromC: si('coldChargeFullFrom'),
      coldChargeShareAtMinus20C: si('coldChargeShare'),
      brakeType: value.brakeType,
      brakeThermalMassJPerK: si('brakeThermalMass'),
      brakeCoolingAreaM2: si('brakeCoolingArea'),
      brakeHeatShare: si('brakeHeatShare'),
      brakeEmissivity: si('brakeEmissivity'),
      retarderPowerW: si('retarderPower'),
      retarderType: value.retarderType,
      regenContinuousPowerW: stated('regenContinuousPower'),
      regenPeakHoldS: si('regenPeakHold'),
      drivenAxleLoadShare: si('drivenAxleLoadShare'),
      rearBrakeShare: si('rearBrakeShare'),
      rearBrakeThermalMassShare: si('rearBrakeThermalMassShare'),
      permissibleGrossMassKg: stated('permissibleGrossMass'),
      lineReceptivity: si('lineReceptivity'),
      powerSource: value.powerSource,
      endOfLifeCapacityFraction: stated('endOfLifeCapacity'),
      endOfLifeChargePowerFraction: stated('endOfLifeChargePower'),
    },
  };
}

/** The message under a field, or null when its value is acceptable. */
export function fieldMessage(field: VehicleField, shown: number | null | undefined, system: UnitSystem): string | null {
  const { min, max } = fieldLimits(field, system);
  const unit = fieldUnit(field, system);
  const range = `${min} to ${max}${unit ? ' ' + unit : ''}`;
  if (shown === null || shown === undefined || Number.isNaN(shown)) return field.optional ? null : `Enter a value (${range}).`;
  if (field.minExclusive ? shown <= min : shown < min) {
    return field.minExclusive ? `Must be more than ${min}${unit ? ' ' + unit : ''}.` : `At least ${min}${unit ? ' ' + unit : ''}.`;
  }
  if (field.maxExclusive ? shown >= max : shown > max) {
    return field.maxExclusive ? `Must be less than ${max}${unit ? ' ' + unit : ''}.` : `At most ${max}${unit ? ' ' + unit : ''}.`;
  }
  return null;
}

/** Rules that tie two fields together: messages keyed by the field they are shown under. */
export function crossFieldMessages(value: VehicleFormValue): Record<string, string> {
  const messages: Record<string, string> = {};
  const { socTaperStart, socCeiling, batteryCapacity, regenPower, regenContinuousPower } = value.numbers;
  if (
    regenContinuousPower !== null &&
    regenContinuousPower !== undefined &&
    regenPower !== null &&
    regenPower !== undefined &&
    regenContinuousPower > regenPower
  ) {
    messages['regenContinuousPower'] = 'Must not be above the peak regenerative power.';
  }
  if (
    socTaperStart !== null &&
    socTaperStart !== undefined &&
    socCeiling !== null &&
    socCeiling !== undefined &&
    socTaperStart > socCeiling
  ) {
    messages['socTaperStart'] = 'Must not be above the SOC at which charging stops.';
  }
  if (value.powerSource === 'battery' && (batteryCapacity ?? 0) <= 0) {
    messages['batteryCapacity'] = 'A battery vehicle needs a usable battery energy above 0 kWh.';
  }
  return messages;
}

function roundTo(value: number, decimals: number): number {
  const factor = 10 ** decimals;
  return Math.round(value * factor) / factor;
}
