import { Injectable, signal } from '@angular/core';
import { UNIT_SYSTEMS, type UnitSystem } from './unit-format';

/** localStorage key of the person's chosen display units. */
export const UNIT_SYSTEM_STORAGE_KEY = 'descentry.unit-system';

/** Metric or imperial display, chosen once and remembered in this browser. */
@Injectable({ providedIn: 'root' })
export class UnitPreference {
  private readonly _system = signal<UnitSystem>(readStoredSystem());

  /** Units every screen displays in. */
  readonly system = this._system.asReadonly();

  choose(system: UnitSystem): void {
    this._system.set(system);
    try {
      localStorage.setItem(UNIT_SYSTEM_STORAGE_KEY, system);
    } catch {
      // Expected when storage is disabled (private mode, policy): the choice lasts this visit.
    }
  }
}

function readStoredSystem(): UnitSystem {
  try {
    const stored = localStorage.getItem(UNIT_SYSTEM_STORAGE_KEY);
    return UNIT_SYSTEMS.find((system) => system === stored) ?? 'metric';
  } catch {
    // Expected when storage is disabled: fall back to metric.
    return 'metric';
  }
}
