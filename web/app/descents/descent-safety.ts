import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { Descent } from '@shared/domain/analysis';
import {
  describeDescentAdvice,
  describeSafetyFlags,
  describeWorstCaseConditions,
  formatTemperatureLimit,
  formatTemperatureReached,
  type UnitSystem,
} from '@shared/presentation/index';
import { RiskChip } from '../ui/risk-chip';
import { SensitivityChart } from './sensitivity-chart';

/** The figures of one side of the comparison (worst case or nominal run). */
interface CaseFigures {
  peak: string;
  front: string | null;
  rear: string | null;
  speed: string;
  speedExplanation: string;
}

/**
 * One descent's safety assessment: the worst credible case beside the nominal run (the risk that
 * counts is the worst case's), what the worst case takes together, the front and rear brakes, the
 * highest battery charge at the top, where the model stops holding or grip runs short, and what
 * moves the peak brake temperature most. Results stored before the worst case existed show the
 * nominal run and say so.
 */
@Component({
  selector: 'app-descent-safety',
  imports: [RiskChip, SensitivityChart],
  template: `
    @let d = descent();
    <div class="cases">
      <section class="case worst" aria-labelledby="{{ id() }}-worst" data-testid="worst-case">
        <h3 [id]="id() + '-worst'">Worst credible case</h3>
        @if (worst(); as w) {
          <app-risk-chip [risk]="d.worstCase!.risk" />
          <dl>
            <dt>Peak brake temperature</dt>
            <dd>{{ w.peak }}</dd>
            @if (w.front) {
              <dt>Front / rear brakes</dt>
              <dd>{{ w.front }} / {{ w.rear }}</dd>
            }
            <dt>Advice</dt>
            <dd>{{ w.speed }}</dd>
          </dl>
        } @else {
          <p class="meta">Not computed for this result: re-run the scenario to get the worst case.</p>
        }
      </section>
      <section class="case" aria-labelledby="{{ id() }}-nominal" data-testid="nominal-case">
        <h3 [id]="id() + '-nominal'">Nominal run, regeneration working</h3>
        <app-risk-chip [risk]="d.nominalRisk ?? d.risk" />
        <dl>
          <dt>Peak brake temperature</dt>
          <dd>{{ nominal().peak }}</dd>
          @if (nominal().front) {
            <dt>Front / rear brakes</dt>
            <dd>{{ nominal().front }} / {{ nominal().rear }}</dd>
          }
          <dt>Advice</dt>
          <dd>{{ nominal().speed }}</dd>
        </dl>
      </section>
    </div>
    <p class="meta">
      Fade starts near {{ fade() }}
      @if (d.fadeMarginK) {
        ; the advice keeps the brakes {{ d.fadeMarginK }} K below it
      }
      . The risk shown for this descent is the worst case's.
    </p>
    @if (conditions(); as parts) {
      <p data-testid="worst-case-conditions"><strong>The worst case takes together:</strong> {{ parts.join('; ') }}.</p>
    }
    <p data-testid="top-soc">
      <strong>{{ advice().socHeadline }}.</strong> {{ advice().socExplanation }}
    </p>
    @if (flags().length > 0) {
      <ul class="flags" data-testid="safety-flags">
        @for (flag of flags(); track flag) {
          <li>{{ flag }}</li>
        }
      </ul>
    }
    @if (d.sensitivity && d.sensitivity.length > 0) {
      <app-sensitivity-chart
        [entries]="d.sensitivity"
        [dominant]="d.sensitivityDominantInput"
        [fadeThresholdC]="d.fadeThresholdC"
        [fadeMarginK]="d.fadeMarginK"
        [units]="units()"
        [id]="id() + '-sensitivity'"
      />
    }
    <p class="caution">
      Model estimates, not measurements. Check them against the vehicle maker's brake limits and local codes, and have a licensed engineer
      sign off before drivers act on them.
    </p>
  `,
  styles: `
    :host {
      display: grid;
      gap: 10px;
    }
    .cases {
      display: grid;
      grid-template-columns: repeat(auto-fit, minmax(min(100%, 240px), 1fr));
      gap: 12px;
    }
    .case {
      border: 1px solid var(--mat-sys-outline-variant);
      border-radius: var(--mat-sys-corner-medium);
      padding: 10px 14px;
      display: grid;
      gap: 8px;
      align-content: start;
    }
    .case.worst {
      border-width: 2px;
      border-color: var(--mat-sys-outline);
    }
    h3 {
      margin: 0;
      font: var(--mat-sys-title-small);
    }
    dl {
      margin: 0;
      display: grid;
      gap: 2px;
    }
    dt {
      color: var(--mat-sys-on-surface-variant);
      font: var(--mat-sys-label-medium);
    }
    dd {
      margin: 0 0 6px;
      overflow-wrap: break-word;
    }
    p {
      margin: 0;
    }
    .meta,
    .caution {
      color: var(--mat-sys-on-surface-variant);
      font: var(--mat-sys-body-small);
    }
    .flags {
      margin: 0;
      padding-left: 20px;
      color: var(--mat-sys-error);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class DescentSafety {
  readonly descent = input.required<Descent>();
  readonly units = input.required<UnitSystem>();
  /** Prefix of the element ids (several assessments can share a page). */
  readonly id = input('descent-safety');

  protected readonly fade = computed(() => formatTemperatureLimit(this.descent().fadeThresholdC, this.units()));
  protected readonly advice = computed(() => describeDescentAdvice(this.descent(), this.units()));

  protected readonly nominal = computed<CaseFigures>(() => {
    const d = this.descent();
    return this.figures(d.peakBrakeTempC, d.peakBrakeTempByAxleC, { ...d });
  });

  protected readonly worst = computed<CaseFigures | null>(() => {
    const d = this.descent();
    const w = d.worstCase;
    return w
      ? this.figures(w.peakBrakeTempC, w.peakBrakeTempByAxleC, { ...d, speedAdvice: w.speedAdvice, maxSafeSpeedKph: w.maxSafeSpeedKph })
      : null;
  });

  protected readonly conditions = computed(() => {
    const w = this.descent().worstCase;
    return w ? describeWorstCaseConditions(w.conditions, this.units()) : null;
  });

  protected readonly flags = computed(() => describeSafetyFlags(this.descent(), this.units()));

  private figures(peakC: number, byAxle: { front: number; rear: number } | undefined, facts: Descent): CaseFigures {
    const system = this.units();
    const advice = describeDescentAdvice(facts, system);
    return {
      peak: formatTemperatureReached(peakC, system),
      front: byAxle ? formatTemperatureReached(byAxle.front, system) : null,
      rear: byAxle ? formatTemperatureReached(byAxle.rear, system) : null,
      speed: advice.speedHeadline,
      speedExplanation: advice.speedExplanation,
    };
  }
}
