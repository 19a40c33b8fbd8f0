/**
 * The scenario form's value and its mapping to the API's scenario draft. Kept apart from the
 * component so the mapping (display units → SI, load and season variants) is tested alone.
 */
import type { Direction, Scenario, ScenarioDraftInput } from '@shared/domain/scenarios';
import type { LoadCase, Season } from '@shared/domain/vehicle-profiles';
import { DEFAULT_START_SOC } from '@shared/domain/limits';
import { displayToKph, fromDisplay, kphToDisplay, toDisplay, type UnitSystem } from '../units/unit-format';

export type LoadChoice = LoadCase | 'passengers';
export type SeasonChoice = Season | 'custom';

export interface ScenarioFormValue {
  name: string;
  routeId: string;
  /** null: the route's latest version when the scenario is saved or re-run. */
  routeVersion: number | null;
  direction: Direction;
  vehicleProfileId: string;
  load: LoadChoice;
  passengers: number;
  season: SeasonChoice;
  /** Custom ambient temperature, displayed unit (°C or °F). */
  customAmbient: number;
  /** Custom auxiliary power, kW. */
  customAuxKw: number;
  /** Start SOC, %. */
  startSocPercent: number;
  spacingM: number;
  smoothingWindowM: number;
  /** Descent speed cap in the displayed unit; null for none. */
  descentSpeedCap: number | null;
  useStops: boolean;
  inService: boolean;
}

export const DEFAULT_SCENARIO_FORM: ScenarioFormValue = {
  name: '',
  routeId: '',
  routeVersion: null,
  direction: 'outbound',
  vehicleProfileId: '',
  load: 'seated',
  passengers: 40,
  season: 'mild',
  customAmbient: 10,
  customAuxKw: 10,
  startSocPercent: DEFAULT_START_SOC * 100,
  spacingM: 10,
  smoothingWindowM: 150,
  descentSpeedCap: null,
  useStops: true,
  inService: false,
};

/** The request body for POST/PUT /api/scenarios, in SI. */
export function toScenarioDraft(value: ScenarioFormValue, system: UnitSystem): ScenarioDraftInput {
  const draft: ScenarioDraftInput = {
    name: value.name.trim(),
    routeId: value.routeId,
    direction: value.direction,
    vehicleProfileId: value.vehicleProfileId,
    load:
      value.load === 'passengers' ? { kind: 'passengers', passengers: Math.round(value.passengers) } : { kind: 'case', case: value.load },
    season:
      value.season === 'custom'
        ? {
            kind: 'custom',
            ambientC: round(fromDisplay('temperature', value.customAmbient, system), 2),
            auxPowerW: Math.round(value.customAuxKw * 1_000),
          }
        : { kind: 'season', season: value.season },
    startSoc: round(value.startSocPercent / 100, 4),
    options: {
      spacingM: value.spacingM,
      smoothingWindowM: value.smoothingWindowM,
      useStops: value.useStops,
      ...(value.descentSpeedCap === null ? {} : { descentSpeedCapKph: round(displayToKph(value.descentSpeedCap, system), 1) }),
    },
    inService: value.inService,
  };
  if (value.routeVersion !== null) draft.routeVersion = value.routeVersion;
  return draft;
}

/** The form value that shows a saved scenario (to edit it or copy it). */
export function toFormValue(scenario: Scenario, system: UnitSystem): ScenarioFormValue {
  const cap = scenario.options.descentSpeedCapKph;
  return {
    name: scenario.name,
    routeId: scenario.routeId,
    routeVersion: scenario.routeVersionPinned ? scenario.routeVersion : null,
    direction: scenario.direction,
    vehicleProfileId: scenario.vehicleProfileId,
    load: scenario.load.kind === 'case' ? scenario.load.case : 'passengers',
    passengers: scenario.load.kind === 'passengers' ? scenario.load.passengers : DEFAULT_SCENARIO_FORM.passengers,
    season: scenario.season.kind === 'season' ? scenario.season.season : 'custom',
    customAmbient:
      scenario.season.kind === 'custom'
        ? round(toDisplay('temperature', scenario.season.ambientC, system), 1)
        : DEFAULT_SCENARIO_FORM.customAmbient,
    customAuxKw: scenario.season.kind === 'custom' ? scenario.season.auxPowerW / 1_000 : DEFAULT_SCENARIO_FORM.customAuxKw,
    startSocPercent: round(scenario.startSoc * 100, 1),
    spacingM: scenario.options.spacingM,
    smoothingWindowM: scenario.options.smoothingWindowM,
    descentSpeedCap: cap === undefined ? null : Math.round(kphToDisplay(cap, system)),
    useStops: scenario.options.useStops,
    inService: scenario.inService,
  };
}

function round(value: number, decimals: number): number {
  const factor = 10 ** decimals;
  return Math.round(value * factor) / factor;
}
