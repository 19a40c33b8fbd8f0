import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { CapabilityCurvesResponse } from '@shared/domain/vehicle-profiles';
import { DistanceChart, type ChartSeries } from '../charts/distance-chart';
import { toDisplay, unitLabel, type UnitSystem } from '../units/unit-format';

/** Grades drawn as required-force curves (steady speed), % (positive uphill). */
const SHOWN_GRADES = [-10, -6, -2, 0, 4, 8, 12];
const GRADE_COLORS = ['#8e1b2c', '#d0601a', '#b58900', '#5c6b70', '#3b7ea1', '#0b5567', '#6a2c91'];

/**
 * Required tractive force against speed on several grades, over the vehicle's traction and regen
 * envelopes: where a grade's curve stays inside the envelope the vehicle can hold that speed; a
 * descent curve below the regen envelope needs the friction brakes or a retarder.
 */
@Component({
  selector: 'app-capability-chart',
  imports: [DistanceChart],
  template: `
    <app-distance-chart
      caption="Capability: force needed at steady speed against the motor envelope"
      [series]="series()"
      [xLabel]="speedUnit()"
      [yLabel]="forceUnit()"
      [heightPx]="320"
    />
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CapabilityChart {
  readonly curves = input.required<CapabilityCurvesResponse>();
  readonly units = input.required<UnitSystem>();

  protected readonly speedUnit = computed(() => unitLabel('speed', this.units()));
  protected readonly forceUnit = computed(() => unitLabel('force', this.units()));

  protected readonly series = computed<ChartSeries[]>(() => {
    const data = this.curves();
    const system = this.units();
    const x = data.speedsMps.map((speed) => toDisplay('speed', speed, system));
    const force = (values: readonly number[]) => values.map((n) => toDisplay('force', n, system));
    const steady = data.curves.filter((curve) => curve.accelerationMps2 === 0 && SHOWN_GRADES.includes(curve.gradePercent));
    return [
      { label: 'Traction envelope', x, y: force(data.tractionEnvelopeN), color: '#1a1c1e', fill: false },
      { label: 'Regen envelope', x, y: force(data.regenEnvelopeN), color: '#3f7f4f', dashed: true },
      ...steady.map((curve) => ({
        label: `${curve.gradePercent > 0 ? '+' : ''}${curve.gradePercent} %`,
        x,
        y: force(curve.requiredForceN),
        color: GRADE_COLORS[SHOWN_GRADES.indexOf(curve.gradePercent)] ?? '#5c6b70',
      })),
    ];
  });
}
