import { ChangeDetectionStrategy, Component } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';

/** The caution that goes with every figure that could hurt someone if taken as final. */
@Component({
  selector: 'app-engineering-caution',
  imports: [MatIconModule],
  template: `
    <aside class="app-caution" aria-label="Engineering caution">
      <mat-icon>warning</mat-icon>
      <p>
        <strong>Engineering estimates.</strong> Descentry's energy, brake-temperature and descent-speed figures come from models and the
        data you give them. Local codes, the vehicle maker's limits and the judgement of licensed engineers decide what is safe in service.
      </p>
    </aside>
  `,
  styles: `
    p {
      margin: 0;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class EngineeringCaution {}
