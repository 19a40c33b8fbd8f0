import { kphToDisplay, toDisplay, type UnitSystem } from '@shared/presentation/index';
import { COORDINATE_DECIMALS } from '../route-draft';

/**
 * How the route editor prints the draft's values in its tables and fields. Typed values are read
 * back through the same units, so what a planner sees is what the route holds.
 */

/** WGS 84 degrees to the decimals the draft keeps (about 0.1 m): "46.550000". */
export function degreesShown(degrees: number): string {
  return degrees.toFixed(COORDINATE_DECIMALS);
}

/** A distance in metres in the shown unit, to the metre, without trailing zeros: "1.25" km. */
export function distanceShown(valueM: number, system: UnitSystem): string {
  return toDisplay('distance', valueM, system)
    .toFixed(3)
    .replace(/\.?0+$/, '');
}

/** A speed limit in km/h in the shown unit, whole: "30" km/h, "19" mph. */
export function speedShown(speedKph: number, system: UnitSystem): string {
  return String(Math.round(kphToDisplay(speedKph, system)));
}
