import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { RiskLevel } from '@shared/domain/analysis';
import { RISK_STYLES } from '@shared/presentation/index';

/** A brake-fade risk level as a small coloured label; the word is always there, not just colour. */
@Component({
  selector: 'app-risk-chip',
  template: `<span
    class="chip"
    [style.background]="style().surface"
    [style.color]="style().text"
    [style.border-color]="style().accent"
    [attr.title]="style().meaning"
    ><span class="dot" [style.background]="style().accent" aria-hidden="true"></span>{{ prefix() }}{{ style().label }}</span
  >`,
  styles: `
    :host {
      display: inline-block;
    }
    .chip {
      display: inline-flex;
      align-items: center;
      gap: 6px;
      padding: 2px 10px 2px 8px;
      border: 1px solid;
      border-radius: 999px;
      font: var(--mat-sys-label-large);
      white-space: nowrap;
      -webkit-print-color-adjust: exact;
      print-color-adjust: exact;
    }
    .dot {
      width: 8px;
      height: 8px;
      border-radius: 50%;
      box-shadow: 0 0 0 1px rgba(255, 255, 255, 0.6);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RiskChip {
  readonly risk = input.required<RiskLevel>();
  /** Text before the level, e.g. "Risk: " where the context does not say it. */
  readonly prefix = input('');

  protected readonly style = computed(() => RISK_STYLES[this.risk()]);
}
