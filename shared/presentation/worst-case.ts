/**
 * The worst credible case of a descent and its sensitivity figures in plain words, for the screens
 * (scenario result, review item). The same rounding toward safety as every other output.
 */
import type { Adhesion, Drivability, SensitivityInput, WorstCaseConditions } from '../domain/analysis';
import { formatTemperatureReached } from './safety-rounding';
import { formatNumber, formatQuantity, type UnitSystem } from './units';

/** What each sensitivity input is and how far it was moved down and up. */
export const SENSITIVITY_INPUT_LABELS: Readonly<Record<SensitivityInput, { label: string; range: string }>> = {
  soc: { label: 'Battery charge at the top', range: '5 SOC points lower / higher' },
  mass: { label: 'Vehicle mass', range: '10 % lighter / heavier' },
  'brake-cooling': { label: 'Brake cooling', range: '30 % weaker / stronger' },
  'brake-thermal-mass': { label: 'Brake thermal mass', range: '20 % smaller / larger' },
  'regen-continuous': { label: 'Regeneration power rating', range: 'peak rating / continuous rating held throughout' },
};

const MASS_BASIS: Readonly<Record<WorstCaseConditions['massBasis'], string>> = {
  stated: 'the mass set for the worst case',
  'permissible-gross-mass': 'the permissible gross mass',
  'run-mass': 'the run’s own mass, as no permissible gross mass is stated',
};

const SURFACE_WORDS: Readonly<Record<WorstCaseConditions['surface'], string>> = {
  dry: 'dry surface',
  wet: 'wet surface',
  snow: 'snow-covered surface',
  ice: 'icy surface',
};

/** The adverse conditions the worst case takes together, one phrase each. */
export function describeWorstCaseConditions(conditions: WorstCaseConditions, system: UnitSystem): string[] {
  const braking = conditions.retarderAvailable
    ? 'regeneration lost; the retarder keeps working'
    : conditions.brakingResistorAvailable
      ? 'regeneration lost; the braking resistor keeps working'
      : 'regeneration lost; the friction brakes take all the braking';
  return [
    braking,
    conditions.socAtTop === null ? null : `battery at ${formatNumber(Math.round(conditions.socAtTop * 100))} % at the top`,
    `${formatQuantity('mass', conditions.massKg, system)}: ${MASS_BASIS[conditions.massBasis]}`,
    `${formatQuantity('temperature', conditions.ambientC, system)} ambient`,
    `brakes already at ${formatTemperatureReached(conditions.brakeTempAtTopC, system)} at the top`,
    SURFACE_WORDS[conditions.surface],
  ].filter((part): part is string => part !== null);
}

/** Warnings about where the model stops holding or grip runs short; empty when there are none. */
export function describeSafetyFlags(
  descent: { drivability?: Drivability | undefined; adhesion?: Adhesion | undefined },
  system: UnitSystem,
): string[] {
  const flags: string[] = [];
  for (const stretch of descent.drivability?.stretches ?? []) {
    flags.push(
      `Not drivable as drawn from ${formatQuantity('distance', stretch.fromM, system)} to ${formatQuantity('distance', stretch.toM, system)}: ${stretch.detail}`,
    );
  }
  const adhesion = descent.adhesion;
  if (adhesion && !adhesion.sufficient) {
    flags.push(
      `Not enough grip: holding speed and making a service stop needs an adhesion of ${formatNumber(adhesion.requiredMu, 2)} ` +
        `at ${formatQuantity('distance', adhesion.requiredAtM, system)}, the ${adhesion.surface} surface gives about ${formatNumber(adhesion.availableMu, 2)}.`,
    );
  }
  if (adhesion?.regenLimitedByAdhesion) {
    flags.push('Grip on the driven axle limits regeneration on part of this descent; the friction brakes take the rest.');
  }
  return flags;
}
