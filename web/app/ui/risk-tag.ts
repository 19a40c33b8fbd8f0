import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { RiskLevel } from '@shared/domain/analysis';
import { RISK_STYLES } from '@shared/presentation/index';

/**
 * A brake-fade risk level as a flat coloured tag for dense places (table cells, counts per
 * level): the level's word on its surface colour, or "3 elevated" when given a count. Where the
 * level stands alone and needs its meaning on hover, use `app-risk-chip`.
 */
@Component({
  selector: 'app-risk-tag',
  template: `{{ text() }}`,
  host: {
    '[style.background]': 'style().surface',
    '[style.color]': 'style().text',
  },
  styles: `
    :host {
      display: inline-block;
      padding: 2px 10px;
      border-radius: 12px;
      font: var(--mat-sys-label-medium);
      white-space: nowrap;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RiskTag {
  readonly risk = input.required<RiskLevel>();
  /** When set, the tag reads "<count> <level>" (e.g. "3 elevated"), counting descents of that level. */
  readonly count = input<number | null>(null);

  protected readonly style = computed(() => RISK_STYLES[this.risk()]);
  protected readonly text = computed(() => {
    const count = this.count();
    const label = this.style().label;
    return count === null ? label : `${count} ${label.toLowerCase()}`;
  });
}
