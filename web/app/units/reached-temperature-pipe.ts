import { Pipe, type PipeTransform } from '@angular/core';
import { formatTemperatureReached } from '@shared/presentation/safety-rounding';
import type { UnitSystem } from './unit-format';

/**
 * `{{ peakBrakeTempC | reachedTemperature: units() }}` → "412 °C": a temperature the brakes reach,
 * rounded up as every output rounds it (shared/presentation/safety-rounding).
 */
@Pipe({ name: 'reachedTemperature' })
export class ReachedTemperaturePipe implements PipeTransform {
  transform(temperatureC: number | null | undefined, system: UnitSystem): string {
    return temperatureC === null || temperatureC === undefined || !Number.isFinite(temperatureC)
      ? '—'
      : formatTemperatureReached(temperatureC, system);
  }
}
