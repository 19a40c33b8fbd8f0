/**
 * The vehicle-profile form: every engine parameter with its group, label, displayed unit, the
 * factor between that unit and SI, its limits and the message shown when a value breaks them.
 * Pure data and functions, so the mapping and the messages are tested without a browser.
 */
import type { VehicleProfile, VehicleProfileDraftInput } from '@shared/domain/vehicle-profiles';

export const VEHICLE_FIELD_GROUPS = [
  'Mass and load',
  'Aerodynamics and tyres',
  'Powertrain',
  'Battery and regeneration limits',
  'Auxiliary loads by season',
  'Brakes and retarder',
  'Overhead-line receptivity',
] as const;
export type VehicleFieldGroup = (typeof VEHICLE_FIELD_GROUPS)[number];

export interface VehicleField {
  /** Form control name. */
  key: string;
  group: VehicleFieldGroup;
  label: string;
  /** Unit shown beside the value ('' for plain numbers). */
  unit: string;
  /** SI value = displayed value × factor. */
  factor: number;
  /** Limits in the displayed unit. */
  min: number;
  max: number;
  /** Whether the minimum itself is refused (e.g. efficiencies must be above 0). */
  minExclusive?: boolean;
  step: number;
  hint?: string;
  /** Reads the SI value from a profile. */
  read: (profile: VehicleProfileDraftInput) => number;
}

const v = (profile: VehicleProfileDraftInput) => profile.vehicle;

export const VEHICLE_FIELDS: readonly VehicleField[] = [
  { key: 'curbMass', group: 'Mass and load', label: 'Curb mass', unit: 't', factor: 1_000, min: 0.1, max: 200, step: 0.1, hint: 'Empty vehicle ready for service.', read: (p) => v(p).curbMassKg },
  { key: 'loadEmpty', group: 'Mass and load', label: 'Payload, empty', unit: 't', factor: 1_000, min: 0, max: 100, step: 0.1, read: (p) => p.loadsKg.empty },
  { key: 'loadSeated', group: 'Mass and load', label: 'Payload, seated', unit: 't', factor: 1_000, min: 0, max: 100, step: 0.1, read: (p) => p.loadsKg.seated },
  { key: 'loadFull', group: 'Mass and load', label: 'Payload, full standing', unit: 't', factor: 1_000, min: 0, max: 100, step: 0.1, read: (p) => p.loadsKg['full-standing'] },
  { key: 'passengerMass', group: 'Mass and load', label: 'Mass per passenger', unit: 'kg', factor: 1, min: 40, max: 120, step: 1, hint: 'Used when a scenario gives a passenger count.', read: (p) => p.passengerMassKg ?? 70 },
  { key: 'rotatingMassFactor', group: 'Mass and load', label: 'Rotating-mass factor', unit: '', factor: 1, min: 0, max: 1, step: 0.01, hint: 'Inertia = (1 + factor) · m · a.', read: (p) => v(p).rotatingMassFactor },

  { key: 'frontalArea', group: 'Aerodynamics and tyres', label: 'Frontal area', unit: 'm²', factor: 1, min: 0, max: 30, minExclusive: true, step: 0.1, read: (p) => v(p).frontalAreaM2 },
  { key: 'dragCoefficient', group: 'Aerodynamics and tyres', label: 'Drag coefficient', unit: '', factor: 1, min: 0, max: 3, step: 0.01, read: (p) => v(p).dragCoefficient },
  { key: 'rollingResistance', group: 'Aerodynamics and tyres', label: 'Rolling resistance coefficient', unit: '', factor: 1, min: 0, max: 0.1, step: 0.001, read: (p) => v(p).rollingResistanceCoefficient },

  { key: 'tractionPower', group: 'Powertrain', label: 'Peak traction power', unit: 'kW', factor: 1_000, min: 0, max: 5_000, minExclusive: true, step: 1, hint: 'At the wheel.', read: (p) => v(p).tractionPowerW },
  { key: 'regenPower', group: 'Powertrain', label: 'Peak regenerative power', unit: 'kW', factor: 1_000, min: 0, max: 5_000, step: 1, hint: '0 means no regeneration at all.', read: (p) => v(p).regenPowerW },
  { key: 'maxTractionForce', group: 'Powertrain', label: 'Tractive force limit', unit: 'kN', factor: 1_000, min: 0, max: 1_000, minExclusive: true, step: 0.5, hint: 'Motor torque at the wheel; also caps the regen force.', read: (p) => v(p).maxTractionForceN ?? 35_000 },
  { key: 'drivetrainEfficiency', group: 'Powertrain', label: 'Drivetrain efficiency', unit: '%', factor: 0.01, min: 0, max: 100, minExclusive: true, step: 0.1, hint: 'Battery (or line) → wheel while motoring.', read: (p) => v(p).drivetrainEfficiency },
  { key: 'regenEfficiency', group: 'Powertrain', label: 'Regeneration efficiency', unit: '%', factor: 0.01, min: 0, max: 100, minExclusive: true, step: 0.1, hint: 'Wheel → battery (or line) while braking.', read: (p) => v(p).regenEfficiency },

  { key: 'batteryCapacity', group: 'Battery and regeneration limits', label: 'Usable battery energy', unit: 'kWh', factor: 1_000, min: 0, max: 5_000, step: 1, hint: 'May be 0 for an overhead-line vehicle without storage.', read: (p) => v(p).batteryCapacityWh },
  { key: 'maxChargePower', group: 'Battery and regeneration limits', label: 'Charge-power limit', unit: 'kW', factor: 1_000, min: 0, max: 5_000, step: 1, read: (p) => v(p).maxChargePowerW },
  { key: 'socTaperStart', group: 'Battery and regeneration limits', label: 'Charge limit starts falling at', unit: '% SOC', factor: 0.01, min: 0, max: 100, step: 1, read: (p) => v(p).socTaperStart ?? 0.85 },
  { key: 'socCeiling', group: 'Battery and regeneration limits', label: 'No charging above', unit: '% SOC', factor: 0.01, min: 0, max: 100, step: 1, read: (p) => v(p).socCeiling ?? 0.95 },
  { key: 'regenMinSpeed', group: 'Battery and regeneration limits', label: 'Regeneration fades out below', unit: 'km/h', factor: 1 / 3.6, min: 0, max: 36, step: 0.5, read: (p) => v(p).regenMinSpeedMps ?? 5 / 3.6 },

  { key: 'winterAmbient', group: 'Auxiliary loads by season', label: 'Winter ambient', unit: '°C', factor: 1, min: -60, max: 60, step: 1, read: (p) => p.seasons.winter.ambientC },
  { key: 'winterAux', group: 'Auxiliary loads by season', label: 'Winter auxiliary power', unit: 'kW', factor: 1_000, min: 0, max: 500, step: 0.5, read: (p) => p.seasons.winter.auxPowerW },
  { key: 'mildAmbient', group: 'Auxiliary loads by season', label: 'Mild ambient', unit: '°C', factor: 1, min: -60, max: 60, step: 1, read: (p) => p.seasons.mild.ambientC },
  { key: 'mildAux', group: 'Auxiliary loads by season', label: 'Mild auxiliary power', unit: 'kW', factor: 1_000, min: 0, max: 500, step: 0.5, read: (p) => p.seasons.mild.auxPowerW },
  { key: 'summerAmbient', group: 'Auxiliary loads by season', label: 'Summer ambient', unit: '°C', factor: 1, min: -60, max: 60, step: 1, read: (p) => p.seasons.summer.ambientC },
  { key: 'summerAux', group: 'Auxiliary loads by season', label: 'Summer auxiliary power', unit: 'kW', factor: 1_000, min: 0, max: 500, step: 0.5, read: (p) => p.seasons.summer.auxPowerW },

  { key: 'brakeThermalMass', group: 'Brakes and retarder', label: 'Brake thermal mass', unit: 'kJ/K', factor: 1_000, min: 0, max: 100_000, minExclusive: true, step: 1, hint: 'All discs or drums with hubs together.', read: (p) => v(p).brakeThermalMassJPerK ?? 92_000 },
  { key: 'brakeCoolingArea', group: 'Brakes and retarder', label: 'Brake cooling area', unit: 'm²', factor: 1, min: 0, max: 100, minExclusive: true, step: 0.1, read: (p) => v(p).brakeCoolingAreaM2 ?? 1.6 },
  { key: 'brakeHeatShare', group: 'Brakes and retarder', label: 'Heat into discs or drums', unit: '%', factor: 0.01, min: 0, max: 100, step: 1, read: (p) => v(p).brakeHeatShare ?? 0.95 },
  { key: 'brakeEmissivity', group: 'Brakes and retarder', label: 'Brake surface emissivity', unit: '', factor: 1, min: 0, max: 1, step: 0.05, read: (p) => v(p).brakeEmissivity ?? 0.6 },
  { key: 'retarderPower', group: 'Brakes and retarder', label: 'Retarder or braking-resistor power', unit: 'kW', factor: 1_000, min: 0, max: 5_000, step: 1, hint: '0 when the vehicle has none.', read: (p) => v(p).retarderPowerW ?? 0 },

  { key: 'lineReceptivity', group: 'Overhead-line receptivity', label: 'Line receptivity', unit: '%', factor: 0.01, min: 0, max: 100, step: 1, hint: 'Share of regenerated power another vehicle on the line can take.', read: (p) => v(p).lineReceptivity ?? 0.5 },
];

export type VehicleNumbers = Record<string, number | null>;

export interface VehicleFormValue {
  name: string;
  description: string;
  powerSource: 'battery' | 'overhead-line';
  brakeType: 'disc' | 'drum';
  numbers: VehicleNumbers;
}

/** Displayed values of a profile (SI ÷ factor, rounded to what a person would type). */
export function toVehicleFormValue(profile: VehicleProfileDraftInput): VehicleFormValue {
  const numbers: VehicleNumbers = {};
  for (const field of VEHICLE_FIELDS) numbers[field.key] = roundTo(field.read(profile) / field.factor, 6);
  return {
    name: profile.name,
    description: profile.description ?? '',
    powerSource: profile.vehicle.powerSource ?? 'battery',
    brakeType: profile.vehicle.brakeType ?? 'disc',
    numbers,
  };
}

/** The request body for POST/PUT /api/vehicles, in SI. */
export function toVehicleDraft(value: VehicleFormValue, vehicleClass: string): VehicleProfileDraftInput {
  const si = (key: string) => {
    const field = VEHICLE_FIELDS.find((candidate) => candidate.key === key);
    const shown = value.numbers[key];
    if (!field || shown === null || shown === undefined) throw new RangeError(`Missing value for ${key}`);
    return roundTo(shown * field.factor, 9);
  };
  const seasons = {
    winter: { ambientC: si('winterAmbient'), auxPowerW: si('winterAux') },
    mild: { ambientC: si('mildAmbient'), auxPowerW: si('mildAux') },
    summer: { ambientC: si('summerAmbient'), auxPowerW: si('summerAux') },
  };
  const loadsKg = { empty: si('loadEmpty'), seated: si('loadSeated'), 'full-standing': si('loadFull') };
  return {
    name: value.name.trim(),
    description: value.description.trim(),
    vehicleClass,
    passengerMassKg: si('passengerMass'),
    loadsKg,
    seasons,
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
      brakeType: value.brakeType,
      brakeThermalMassJPerK: si('brakeThermalMass'),
      brakeCoolingAreaM2: si('brakeCoolingArea'),
      brakeHeatShare: si('brakeHeatShare'),
      brakeEmissivity: si('brakeEmissivity'),
      retarderPowerW: si('retarderPower'),
      lineReceptivity: si('lineReceptivity'),
      powerSource: value.powerSource,
    },
  };
}

/** The message under a field, or null when its value is acceptable. */
export function fieldMessage(field: VehicleField, shown: number | null | undefined): string | null {
  const range = `${field.min}${field.unit && !field.unit.startsWith('%') ? ' ' : ' '}to ${field.max}${field.unit ? ' ' + field.unit : ''}`.replace(/\s+/g, ' ');
  if (shown === null || shown === undefined || Number.isNaN(shown)) return `Enter a value (${range}).`;
  if (field.minExclusive ? shown <= field.min : shown < field.min) {
    return field.minExclusive ? `Must be more than ${field.min}${field.unit ? ' ' + field.unit : ''}.` : `At least ${field.min}${field.unit ? ' ' + field.unit : ''}.`;
  }
  if (shown > field.max) return `At most ${field.max}${field.unit ? ' ' + field.unit : ''}.`;
  return null;
}

/** Rules that tie two fields together: messages keyed by the field they are shown under. */
export function crossFieldMessages(value: VehicleFormValue): Record<string, string> {
  const messages: Record<string, string> = {};
  const { socTaperStart, socCeiling, batteryCapacity } = value.numbers;
  if (socTaperStart !== null && socTaperStart !== undefined && socCeiling !== null && socCeiling !== undefined && socTaperStart > socCeiling) {
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
