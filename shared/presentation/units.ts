/**
 * Display units. Everything inside Descentry is SI; these functions convert only at the edge, for
 * what a person reads: km, km/h, %, kWh, °C, t, m², kJ/K (metric) or mi, mph, %, kWh, °F, short tons,
 * ft², BTU/°F (imperial).
 */

import { kphToMps, mpsToKph } from '../engine/unit-conversions';

/** km/h ↔ m/s for forms that keep a speed in SI (one conversion for the whole product). */
export { kphToMps, mpsToKph };

export const UNIT_SYSTEMS = ['metric', 'imperial'] as const;
export type UnitSystem = (typeof UNIT_SYSTEMS)[number];

/** A kind of quantity as the interface shows it; each names the SI unit it is given in. */
export type Quantity =
  | 'distance' // m → km / mi
  | 'elevation' // m → m / ft
  | 'speed' // m/s → km/h / mph
  | 'temperature' // °C → °C / °F
  | 'mass' // kg → t / short ton
  | 'lightMass' // kg → kg / lb (a person, a part)
  | 'force' // N → kN / lbf
  | 'energy' // Wh → kWh (both)
  | 'energyPerDistance' // kWh/km → kWh/km / kWh/mi
  | 'power' // W → kW (both: the trade rates electric machines in kW)
  | 'grade' // % → % (both)
  | 'soc' // 0–1 → %
  | 'area' // m² → m² / ft²
  | 'heatCapacity' // J/K → kJ/K / BTU/°F (a brake's thermal mass)
  | 'duration' // s → min (both)
  | 'efficiency'; // 0–1 → % (both)

const METRES_PER_MILE = 1_609.344;
const METRES_PER_FOOT = 0.3048;
/** Exact by definition (international pound, 1959): 1 lb = 0.45359237 kg. */
const KG_PER_POUND = 0.45359237;
/** Exact by definition: 1 short ton = 2 000 lb = 907.18474 kg. */
const KG_PER_SHORT_TON = 2_000 * KG_PER_POUND;
const NEWTONS_PER_POUND_FORCE = 4.4482216152605;
/** Exact by definition: 1 ft = 0.3048 m, so 1 ft² = 0.09290304 m². */
const SQUARE_METRES_PER_SQUARE_FOOT = METRES_PER_FOOT * METRES_PER_FOOT;
/** International Table BTU = 1 055.05585262 J (exact by definition); per °F is per 5/9 K. */
const JOULES_PER_KELVIN_PER_BTU_PER_FAHRENHEIT = 1_055.05585262 * 1.8;

interface Scale {
  unit: string;
  /** Converts the SI value to the displayed number. */
  from: (si: number) => number;
  /** Converts a displayed number back to SI (form input). */
  to: (shown: number) => number;
  /** Decimals shown by default. */
  digits: number;
}

const linear = (unit: string, factor: number, digits: number): Scale => ({
  unit,
  from: (si) => si * factor,
  to: (shown) => shown / factor,
  digits,
});

const SCALES: Readonly<Record<UnitSystem, Readonly<Record<Quantity, Scale>>>> = {
  metric: {
    distance: linear('km', 1 / 1_000, 2),
    elevation: linear('m', 1, 0),
    speed: linear('km/h', 3.6, 0),
    temperature: linear('°C', 1, 0),
    mass: linear('t', 1 / 1_000, 1),
    lightMass: linear('kg', 1, 0),
    force: linear('kN', 1 / 1_000, 1),
    energy: linear('kWh', 1 / 1_000, 1),
    energyPerDistance: linear('kWh/km', 1, 2),
    power: linear('kW', 1 / 1_000, 0),
    grade: linear('%', 1, 1),
    soc: linear('%', 100, 0),
    area: linear('m²', 1, 1),
    heatCapacity: linear('kJ/K', 1 / 1_000, 0),
    duration: linear('min', 1 / 60, 1),
    efficiency: linear('%', 100, 1),
  },
  imperial: {
    distance: linear('mi', 1 / METRES_PER_MILE, 2),
    elevation: linear('ft', 1 / METRES_PER_FOOT, 0),
    speed: linear('mph', 3.6 / 1.609344, 0),
    temperature: { unit: '°F', from: (c) => (c * 9) / 5 + 32, to: (f) => ((f - 32) * 5) / 9, digits: 0 },
    mass: linear('tn', 1 / KG_PER_SHORT_TON, 1),
    lightMass: linear('lb', 1 / KG_PER_POUND, 0),
    force: linear('lbf', 1 / NEWTONS_PER_POUND_FORCE, 0),
    energy: linear('kWh', 1 / 1_000, 1),
    energyPerDistance: linear('kWh/mi', 1.609344, 2),
    power: linear('kW', 1 / 1_000, 0),
    grade: linear('%', 1, 1),
    soc: linear('%', 100, 0),
    area: linear('ft²', 1 / SQUARE_METRES_PER_SQUARE_FOOT, 0),
    heatCapacity: linear('BTU/°F', 1 / JOULES_PER_KELVIN_PER_BTU_PER_FAHRENHEIT, 0),
    duration: linear('min', 1 / 60, 1),
    efficiency: linear('%', 100, 1),
  },
};

/** The unit symbol shown for `quantity`, e.g. "km/h" or "mph". */
export function unitLabel(quantity: Quantity, system: UnitSystem): string {
  return SCALES[system][quantity].unit;
}

/** The displayed number for an SI value (no rounding). */
export function toDisplay(quantity: Quantity, siValue: number, system: UnitSystem): number {
  return SCALES[system][quantity].from(siValue);
}

/** The SI value for a displayed number (what a person typed). */
export function fromDisplay(quantity: Quantity, shownValue: number, system: UnitSystem): number {
  return SCALES[system][quantity].to(shownValue);
}

/** A speed given in km/h (the contract's `…Kph` fields) as displayed: km/h or mph (no rounding). */
export function kphToDisplay(speedKph: number, system: UnitSystem): number {
  return toDisplay('speed', kphToMps(speedKph), system);
}

/** The km/h value of a displayed speed (what a person typed in km/h or mph). */
export function displayToKph(shownSpeed: number, system: UnitSystem): number {
  return mpsToKph(fromDisplay('speed', shownSpeed, system));
}

/**
 * "12.35 km", "1 250 m", "−3.4 %": the SI value in the chosen system, rounded, with its unit.
 * Missing values read "—" so a table never shows "NaN".
 */
export function formatQuantity(quantity: Quantity, siValue: number | null | undefined, system: UnitSystem, digits?: number): string {
  if (siValue === null || siValue === undefined || !Number.isFinite(siValue)) return '—';
  const scale = SCALES[system][quantity];
  return `${formatNumber(scale.from(siValue), digits ?? scale.digits)} ${scale.unit}`;
}

/**
 * "12 345.6", "−3": a plain number with `digits` decimals, thousands grouped, a true minus sign,
 * and never "−0" (a value that rounds to zero is zero).
 */
export function formatNumber(value: number, digits = 0): string {
  if (!Number.isFinite(value)) return '—';
  const text = value.toLocaleString('en-GB', { minimumFractionDigits: digits, maximumFractionDigits: digits });
  // A true minus sign reads better than a hyphen beside a number; "-0" is just 0.
  return text.replace(/^-(?=[0-9.,]*$)/, '−').replace(/^−(0(\.0+)?)$/, '$1');
}

/** How many decimals `quantity` shows by default in `system`. */
export function defaultDigits(quantity: Quantity, system: UnitSystem): number {
  return SCALES[system][quantity].digits;
}
