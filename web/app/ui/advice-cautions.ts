import { ChangeDetectionStrategy, Component } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { ADVICE_CAUTIONS, ADVICE_CAUTIONS_TITLE } from '@shared/presentation/index';

/**
 * The cautions that stand beside descent advice (safe speed, SOC limit, risk): regeneration is
 * not a fail-safe brake, type approval and the operator's procedures govern, engineers decide.
 * The words come from the shared presentation module, as in the PDFs and e-mails.
 */
@Component({
  selector: 'app-advice-cautions',
  imports: [MatIconModule],
  template: `
    <aside class="app-caution" [attr.aria-label]="title" data-testid="advice-cautions">
      <mat-icon>warning</mat-icon>
      <div>
        <strong>{{ title }}</strong>
        <ul>
          @for (caution of cautions; track $index) {
            <li>{{ caution }}</li>
          }
        </ul>
      </div>
    </aside>
  `,
  styles: `
    ul {
      margin: 4px 0 0;
      padding-left: 18px;
    }
    li + li {
      margin-top: 2px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AdviceCautions {
  protected readonly title = ADVICE_CAUTIONS_TITLE;
  protected readonly cautions = ADVICE_CAUTIONS;
}
