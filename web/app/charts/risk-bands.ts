import { BRAKE_RISK_BANDS_C } from '@shared/engine/descents';
import { RISK_STYLES, toDisplay, type UnitSystem } from '@shared/presentation/index';
import { withAlpha } from './chart-colour';
import type { ChartBand } from './distance-chart';

/**
 * Shaded brake-temperature risk bands for a temperature chart, in the shared risk colours. The
 * brake type is read from the fade threshold (the "high" band edge); disc brakes when there is no
 * descent to tell.
 */
export function brakeRiskBands(fadeThresholdC: number | undefined, system: UnitSystem): ChartBand[] {
  const bands = fadeThresholdC === BRAKE_RISK_BANDS_C.drum.high ? BRAKE_RISK_BANDS_C.drum : BRAKE_RISK_BANDS_C.disc;
  const t = (c: number) => toDisplay('temperature', c, system);
  return [
    { from: t(bands.elevated), to: t(bands.high), color: withAlpha(RISK_STYLES.elevated.accent, 0.14), label: 'Elevated' },
    { from: t(bands.high), to: t(bands.critical), color: withAlpha(RISK_STYLES.high.accent, 0.16), label: 'High: brakes fade' },
    { from: t(bands.critical), to: t(bands.critical + 1_000), color: withAlpha(RISK_STYLES.critical.accent, 0.16), label: 'Critical' },
  ];
}
