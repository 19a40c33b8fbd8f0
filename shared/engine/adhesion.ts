/**
 * Adhesion between wheel and running surface, and what it allows.
 *
 * Road (tyre on asphalt), from R. K. Noon, Engineering Analysis of Vehicular Accidents (CRC Press,
 * 1994), table of average friction coefficients: dry asphaltic concrete 0.65, wet asphaltic
 * concrete 0.50, snow 0.20–0.25, ice 0.10–0.15. The engine takes the lower end of each range.
 *
 * Rail (steel wheel on steel rail): the table of adhesion by state of rail used in electric
 * traction calculations (dry without sanding 0.25, moist 0.20, wet 0.05–0.15); wet rail is taken
 * at 0.10. Contaminated rail (leaves, grease, the 'snow' surface) at 0.05 and the worst rail (the
 * 'ice' surface) at 0.02: the Rail Safety and Standards Board's Review of low adhesion research
 * (2004) reports leaf films taking adhesion well below 0.05. Figures are planning values; the
 * operator's own measurements and the maker's wheel-slide protection data decide.
 */
import type { RunningGear, Surface } from '../domain/analysis';

export const ADHESION_COEFFICIENTS: Record<RunningGear, Record<Surface, number>> = {
  road: { dry: 0.65, wet: 0.5, snow: 0.2, ice: 0.1 },
  rail: { dry: 0.25, wet: 0.1, snow: 0.05, ice: 0.02 },
};

/** What each surface means for a rail vehicle. */
export const RAIL_SURFACE_MEANING: Record<Surface, string> = {
  dry: 'dry rail',
  wet: 'wet rail',
  snow: 'contaminated rail (leaves, grease, snow)',
  ice: 'worst rail (leaf film, ice)',
};

/** Adhesion coefficient μ of a running surface. */
export function adhesionCoefficient(runningGear: RunningGear, surface: Surface): number {
  return ADHESION_COEFFICIENTS[runningGear][surface];
}
