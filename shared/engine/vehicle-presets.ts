/**
 * Generic vehicle-class presets (never a maker's model). Values are the typical figures of
 * engine README §1.3, all from memory unless a source is named there, to be replaced by fleet data:
 * curb mass, frontal area, Cd, Cr, rotating-mass factor, motor power, battery size, charge rate,
 * auxiliary loads. Efficiencies: drivetrain 0.97·0.94·0.975 = 0.889 wheel↔DC bus (engine README §3.2),
 * times a one-way battery efficiency of 0.97 for battery vehicles (0.862). Brake thermal mass:
 * 50 kg of cast iron per corner at 460 J/(kg·K) (Engineering ToolBox, "Metals – Specific Heats"; engine README §4.3); cooled area
 * 0.4 m² per corner (from memory).
 *
 * Passenger mass: 70 kg per passenger (from memory; common planning figures are 68–75 kg).
 * Load variants: empty, all seats taken, full standing load at 6 standing passengers per m²
 * (from memory: 6–8 /m² is the crush-load range for trams; engine README §1.3).
 */
import type { VehicleInput } from '../domain/analysis';

/** Mass per passenger used by the load variants, kg (from memory: 68–75 kg). */
export const PASSENGER_MASS_KG = 70;

export type LoadVariant = 'empty' | 'seated' | 'full';
export type Season = 'winter' | 'summer' | 'mild';

export interface VehiclePreset {
  id: string;
  /** Display name of our own. */
  name: string;
  /** Vehicle with the seated load and mild-season auxiliaries. */
  vehicle: VehicleInput;
  seats: number;
  standingPlaces: number;
  /** Payload per load variant, kg. */
  payloadKg: Record<LoadVariant, number>;
  /** Auxiliary power per season, W. */
  auxPowerW: Record<Season, number>;
}

function loads(seats: number, standingPlaces: number): Record<LoadVariant, number> {
  return {
    empty: 0,
    seated: seats * PASSENGER_MASS_KG,
    full: (seats + standingPlaces) * PASSENGER_MASS_KG,
  };
}

const BATTERY_REGEN_EFFICIENCY = 0.889 * 0.97; // wheel → DC bus → cells (engine README §3.2)
const LINE_EFFICIENCY = 0.889; // wheel ↔ DC bus, no storage (engine README §3.2)

export const VEHICLE_PRESETS: readonly VehiclePreset[] = [
  {
    id: 'battery-bus-12m',
    name: '12 m battery bus',
    seats: 30,
    standingPlaces: 55,
    payloadKg: loads(30, 55),
    // Winter: 10–30 kW resistive heating + ~5 kW other loads; summer: 5–15 kW cooling + ~5 kW (engine README §1.3).
    auxPowerW: { winter: 22_000, summer: 14_000, mild: 6_000 },
    vehicle: {
      curbMassKg: 13_500,
      payloadKg: 30 * PASSENGER_MASS_KG,
      frontalAreaM2: 8.0,
      dragCoefficient: 0.7,
      rollingResistanceCoefficient: 0.007,
      rotatingMassFactor: 0.03,
      tractionPowerW: 250_000,
      regenPowerW: 180_000,
      drivetrainEfficiency: 0.889 * 0.97,
      regenEfficiency: BATTERY_REGEN_EFFICIENCY,
      batteryCapacityWh: 350_000,
      maxChargePowerW: 175_000, // 0.5 C of 350 kWh (from memory: 0.5–1 C continuous)
      auxPowerW: 6_000,
      maxTractionForceN: 35_000,
      brakeType: 'disc',
      brakeThermalMassJPerK: 92_000,
      brakeCoolingAreaM2: 1.6,
      brakeHeatShare: 0.95,
      brakeEmissivity: 0.6,
      retarderPowerW: 0,
      powerSource: 'battery',
      socTaperStart: 0.85,
      socCeiling: 0.95,
    },
  },
  {
    id: 'battery-bus-18m-articulated',
    name: '18 m articulated battery bus',
    seats: 45,
    standingPlaces: 100,
    payloadKg: loads(45, 100),
    auxPowerW: { winter: 32_000, summer: 20_000, mild: 8_000 },
    vehicle: {
      curbMassKg: 19_500,
      payloadKg: 45 * PASSENGER_MASS_KG,
      frontalAreaM2: 8.2,
      dragCoefficient: 0.8,
      rollingResistanceCoefficient: 0.007,
      rotatingMassFactor: 0.03,
      tractionPowerW: 320_000,
      regenPowerW: 240_000,
      drivetrainEfficiency: 0.889 * 0.97,
      regenEfficiency: BATTERY_REGEN_EFFICIENCY,
      batteryCapacityWh: 550_000,
      maxChargePowerW: 275_000,
      auxPowerW: 8_000,
      maxTractionForceN: 50_000,
      brakeType: 'disc',
      brakeThermalMassJPerK: 138_000, // six braked corners × 50 kg × 460 J/(kg·K)
      brakeCoolingAreaM2: 2.4,
      brakeHeatShare: 0.95,
      brakeEmissivity: 0.6,
      retarderPowerW: 0,
      powerSource: 'battery',
      socTaperStart: 0.85,
      socCeiling: 0.95,
    },
  },
  {
    id: 'battery-midibus',
    name: 'Battery midibus (8–9.5 m)',
    seats: 22,
    standingPlaces: 30,
    payloadKg: loads(22, 30),
    auxPowerW: { winter: 12_000, summer: 8_000, mild: 3_500 },
    vehicle: {
      curbMassKg: 8_500,
      payloadKg: 22 * PASSENGER_MASS_KG,
      frontalAreaM2: 6.8,
      dragCoefficient: 0.68,
      rollingResistanceCoefficient: 0.007,
      rotatingMassFactor: 0.05,
      tractionPowerW: 150_000,
      regenPowerW: 110_000,
      drivetrainEfficiency: 0.889 * 0.97,
      regenEfficiency: BATTERY_REGEN_EFFICIENCY,
      batteryCapacityWh: 220_000,
      maxChargePowerW: 110_000,
      auxPowerW: 3_500,
      maxTractionForceN: 24_000,
      brakeType: 'disc',
      brakeThermalMassJPerK: 64_400, // 4 × 35 kg × 460 J/(kg·K)
      brakeCoolingAreaM2: 1.3,
      brakeHeatShare: 0.95,
      brakeEmissivity: 0.6,
      retarderPowerW: 0,
      powerSource: 'battery',
      socTaperStart: 0.85,
      socCeiling: 0.95,
    },
  },
  {
    id: 'trolleybus-12m',
    name: '12 m trolleybus',
    seats: 30,
    standingPlaces: 55,
    payloadKg: loads(30, 55),
    auxPowerW: { winter: 22_000, summer: 14_000, mild: 6_000 },
    vehicle: {
      curbMassKg: 12_000,
      payloadKg: 30 * PASSENGER_MASS_KG,
      frontalAreaM2: 8.3,
      dragCoefficient: 0.8,
      rollingResistanceCoefficient: 0.007,
      rotatingMassFactor: 0.03,
      tractionPowerW: 200_000,
      regenPowerW: 160_000,
      drivetrainEfficiency: LINE_EFFICIENCY,
      regenEfficiency: LINE_EFFICIENCY,
      batteryCapacityWh: 40_000, // off-wire battery (not modelled along the route)
      maxChargePowerW: 120_000,
      auxPowerW: 6_000,
      maxTractionForceN: 32_000,
      brakeType: 'disc',
      brakeThermalMassJPerK: 92_000,
      brakeCoolingAreaM2: 1.6,
      brakeHeatShare: 0.95,
      brakeEmissivity: 0.6,
      retarderPowerW: 160_000, // on-board braking resistor ≈ motor rating (from memory, engine README §3.5)
      lineReceptivity: 0.5, // from memory: 0.3–0.6 without reversible substations
      powerSource: 'overhead-line',
      socTaperStart: 0.85,
      socCeiling: 0.95,
    },
  },
  {
    id: 'light-rail-vehicle',
    name: 'Light-rail vehicle / tram (28–35 m)',
    seats: 60,
    standingPlaces: 160,
    payloadKg: loads(60, 160),
    auxPowerW: { winter: 50_000, summer: 40_000, mild: 12_000 },
    vehicle: {
      curbMassKg: 40_000,
      payloadKg: 60 * PASSENGER_MASS_KG,
      frontalAreaM2: 9.0,
      dragCoefficient: 0.7,
      rollingResistanceCoefficient: 0.002, // steel wheel on rail (engineeringarchives: 0.002–0.003)
      rotatingMassFactor: 0.08,
      tractionPowerW: 600_000,
      regenPowerW: 500_000,
      drivetrainEfficiency: 0.97 * 0.94 * 0.97,
      regenEfficiency: 0.97 * 0.94 * 0.97,
      batteryCapacityWh: 0,
      maxChargePowerW: 0,
      auxPowerW: 12_000,
      maxTractionForceN: 90_000,
      brakeType: 'disc',
      brakeThermalMassJPerK: 368_000, // 16 braked wheels' discs, 50 kg each × 460 J/(kg·K)
      brakeCoolingAreaM2: 6.4,
      brakeHeatShare: 0.95,
      brakeEmissivity: 0.6,
      retarderPowerW: 500_000, // braking resistors (from memory)
      lineReceptivity: 0.5,
      powerSource: 'overhead-line',
      socTaperStart: 0.85,
      socCeiling: 0.95,
    },
  },
];

/** The preset with `id`, with the chosen load and season applied. */
export function presetVehicle(id: string, load: LoadVariant = 'seated', season: Season = 'mild'): VehicleInput {
  const preset = VEHICLE_PRESETS.find((candidate) => candidate.id === id);
  if (!preset) throw new RangeError(`presetId: unknown vehicle preset "${id}"`);
  return { ...preset.vehicle, payloadKg: preset.payloadKg[load], auxPowerW: preset.auxPowerW[season] };
}
