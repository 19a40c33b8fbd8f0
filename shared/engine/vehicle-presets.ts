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
 * Load variants: empty, all seats taken, full standing load.
 *
 * Permissible gross mass (the worst credible case's heaviest mass, and the ceiling every load must
 * stay under), for buses from Directive 96/53/EC as amended by Directive (EU) 2015/719 and
 * Regulation (EU) 2019/1242 (EUR-Lex summary of the directive): two-axle buses 19.5 t (the 2015
 * amendment's +1.5 t); three-axle articulated buses 28 t, plus the zero-emission allowance of up to
 * 1 t for three-axle articulated buses, 29 t in all. The zero-emission tonne is not given to
 * two-axle buses, so those stay at 19.5 t. Full standing loads are set so the full bus fits. The
 * midibus's 13 t is a technically permissible mass typical of the class (from memory: 12–14 t),
 * well under the legal 19.5 t. Trams follow the design-mass convention of EN 15663 (from memory):
 * the exceptional payload puts every seat and 8 standing passengers per m² of standing area on
 * board at 70 kg each, and that design mass is the permissible mass.
 *
 * Continuous regeneration rating: 70 % of the peak, held for 60 s (from memory: traction motors'
 * continuous ratings are commonly 60–75 % of their short-time peak).
 * Friction-brake split: 60 % of the braking on the rear axle of a two-axle bus (from memory:
 * 55–65 %), the brake groups' thermal mass and cooled area split by the number of braked axles.
 * Driven-axle load: the rear (driven) axle of a two-axle bus carries about 60 % of the weight;
 * an articulated pusher bus about 40 % on its driven rear axle; a tram with two of three bogies
 * motored about 2/3 (from memory).
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
      retarderType: 'none',
      regenContinuousPowerW: 126_000,
      regenPeakHoldS: 60,
      drivenAxleLoadShare: 0.6,
      rearBrakeShare: 0.6,
      rearBrakeThermalMassShare: 0.5,
      permissibleGrossMassKg: 19_500,
    },
  },
  {
    id: 'battery-bus-18m-articulated',
    name: '18 m articulated battery bus',
    seats: 45,
    // 29 t permissible − 19.5 t curb = 9.5 t: 135 passengers at 70 kg (45 seated, 90 standing).
    standingPlaces: 90,
    payloadKg: loads(45, 90),
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
      retarderType: 'none',
      regenContinuousPowerW: 168_000,
      regenPeakHoldS: 60,
      drivenAxleLoadShare: 0.4,
      // Front axle one group; middle and rear axles the other (two of three braked axles).
      rearBrakeShare: 0.7,
      rearBrakeThermalMassShare: 2 / 3,
      permissibleGrossMassKg: 29_000,
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
      retarderType: 'none',
      regenContinuousPowerW: 77_000,
      regenPeakHoldS: 60,
      drivenAxleLoadShare: 0.6,
      rearBrakeShare: 0.6,
      rearBrakeThermalMassShare: 0.5,
      permissibleGrossMassKg: 13_000,
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
      retarderType: 'braking-resistor',
      regenContinuousPowerW: 112_000,
      regenPeakHoldS: 60,
      drivenAxleLoadShare: 0.6,
      rearBrakeShare: 0.6,
      rearBrakeThermalMassShare: 0.5,
      permissibleGrossMassKg: 19_500,
    },
  },
  {
    id: 'light-rail-vehicle',
    name: 'Light-rail vehicle / tram (28–35 m)',
    seats: 60,
    // 40 m² of standing area at 8 passengers per m² (EN 15663 exceptional payload, from memory).
    standingPlaces: 320,
    payloadKg: loads(60, 320),
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
      // Three two-axle bogies, one disc per wheel: 12 discs × 50 kg × 460 J/(kg·K), 0.4 m² each.
      brakeThermalMassJPerK: 276_000,
      brakeCoolingAreaM2: 4.8,
      brakeHeatShare: 0.95,
      brakeEmissivity: 0.6,
      retarderPowerW: 500_000, // braking resistors (from memory)
      lineReceptivity: 0.5,
      powerSource: 'overhead-line',
      socTaperStart: 0.85,
      socCeiling: 0.95,
      retarderType: 'braking-resistor',
      regenContinuousPowerW: 350_000,
      regenPeakHoldS: 60,
      drivenAxleLoadShare: 2 / 3,
      // Leading and trailing halves of the bogies share the braking evenly.
      rearBrakeShare: 0.5,
      rearBrakeThermalMassShare: 0.5,
      runningGear: 'rail',
      // Curb 40 t + (60 seated + 320 standing) × 70 kg = 66.6 t design mass under exceptional payload.
      permissibleGrossMassKg: 66_600,
    },
  },
];

/** The preset with `id`, with the chosen load and season applied. */
export function presetVehicle(id: string, load: LoadVariant = 'seated', season: Season = 'mild'): VehicleInput {
  const preset = VEHICLE_PRESETS.find((candidate) => candidate.id === id);
  if (!preset) throw new RangeError(`presetId: unknown vehicle preset "${id}"`);
  return { ...preset.vehicle, payloadKg: preset.payloadKg[load], auxPowerW: preset.auxPowerW[season] };
}
