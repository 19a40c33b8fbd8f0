import { Directive, ElementRef, Injector, inject } from '@angular/core';
import { NG_VALUE_ACCESSOR, NgControl, type AbstractControl, type ControlValueAccessor } from '@angular/forms';

/**
 * The text of a table cell as its form control's value, for number fields too. Angular's own
 * accessor for `type="number"` would turn the text into a number and print it back its own way
 * (46.55 instead of the table's 46.550000); here the control holds exactly the text the field
 * shows, the table prints the draft's values, and the table's form reads the typed number from
 * the text when the change is committed.
 */
@Directive({
  selector: 'input[appCellText]',
  providers: [{ provide: NG_VALUE_ACCESSOR, useExisting: CellText, multi: true }],
  host: { '(input)': 'typed()', '(blur)': 'left()' },
})
export class CellText implements ControlValueAccessor {
  private readonly element = inject<ElementRef<HTMLInputElement>>(ElementRef).nativeElement;
  // The field's control directive asks for this accessor, so it is looked up when needed, not injected.
  private readonly injector = inject(Injector);
  private onChange: (text: string) => void = () => undefined;
  private onTouched: () => void = () => undefined;

  /** The field's control while the person is in the field (its text is theirs until they commit it), else null. */
  focusedControl(): AbstractControl | null {
    if (this.element.ownerDocument.activeElement !== this.element) return null;
    return this.injector.get(NgControl, null, { self: true })?.control ?? null;
  }

  writeValue(text: string | null): void {
    const shown = text ?? '';
    if (this.element.value !== shown) this.element.value = shown;
  }

  registerOnChange(fn: (text: string) => void): void {
    this.onChange = fn;
  }

  registerOnTouched(fn: () => void): void {
    this.onTouched = fn;
  }

  setDisabledState(disabled: boolean): void {
    this.element.disabled = disabled;
  }

  protected typed(): void {
    this.onChange(this.element.value);
  }

  protected left(): void {
    this.onTouched();
  }
}
