import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { UnitPreference } from './unit-preference';
import type { UnitSystem } from './unit-format';

/** Metric / imperial toggle; the choice is remembered in this browser. */
@Component({
  selector: 'app-unit-switch',
  imports: [MatButtonToggleModule],
  template: `
    <mat-button-toggle-group
      hideSingleSelectionIndicator
      aria-label="Display units"
      [value]="preference.system()"
      (change)="choose($event.value)"
    >
      <mat-button-toggle value="metric">Metric</mat-button-toggle>
      <mat-button-toggle value="imperial">Imperial</mat-button-toggle>
    </mat-button-toggle-group>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class UnitSwitch {
  protected readonly preference = inject(UnitPreference);

  protected choose(system: UnitSystem): void {
    this.preference.choose(system);
  }
}
