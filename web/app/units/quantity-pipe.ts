import { Pipe, type PipeTransform } from '@angular/core';
import { formatQuantity, type Quantity, type UnitSystem } from './unit-format';

/** `{{ lengthM | quantity: 'distance' : units() }}` → "12.35 km" or "7.67 mi". */
@Pipe({ name: 'quantity' })
export class QuantityPipe implements PipeTransform {
  transform(siValue: number | null | undefined, quantity: Quantity, system: UnitSystem, digits?: number): string {
    return formatQuantity(quantity, siValue, system, digits);
  }
}
