import { FormControl, FormGroup, type AbstractControl, type FormArray, type ValidatorFn } from '@angular/forms';

/** One table row's controls: the text of each cell, keyed by column. */
export type CellControls<K extends string> = { [P in K]: FormControl<string> };

/** One table row's form. */
export type RowForm<K extends string> = FormGroup<CellControls<K>>;

/** A cell holding the text the table shows, checked by `validators`. */
export function cell(validators: ValidatorFn[] = []): FormControl<string> {
  return new FormControl('', { nonNullable: true, validators });
}

/**
 * Brings a table's rows in step with the draft after any change to it (an edit typed in the
 * table, a map edit, undo or redo): one row per item, every cell showing the item as the table
 * prints it, untouched and pristine. The cell the person is typing in (`typing`, focused and
 * changed since) keeps its text, so an edit landing meanwhile never overwrites half a number.
 */
export function syncRows<K extends string>(
  rows: FormArray<RowForm<K>>,
  shown: readonly Readonly<Record<K, string>>[],
  newRow: () => RowForm<K>,
  typing: AbstractControl | null,
): void {
  while (rows.length > shown.length) rows.removeAt(rows.length - 1, { emitEvent: false });
  shown.forEach((texts, index) => {
    if (index >= rows.length) rows.push(newRow(), { emitEvent: false });
    showRow(rows.at(index), texts, typing);
  });
}

/** Shows one item in its row (see `syncRows`). */
export function showRow<K extends string>(
  row: RowForm<K>,
  texts: Readonly<Record<K, string>>,
  typing: AbstractControl | null = null,
): void {
  for (const key of Object.keys(texts) as K[]) {
    const control = row.controls[key];
    if (control === typing && control.dirty) continue;
    if (control.value !== texts[key]) control.setValue(texts[key], { emitEvent: false });
    control.markAsPristine();
    control.markAsUntouched();
  }
}

/**
 * A cell's text as a number, or null when it holds none (empty, or what a number field gives for
 * text it cannot read).
 */
export function numberIn(text: string): number | null {
  if (text.trim() === '') return null;
  const value = Number(text);
  return Number.isFinite(value) ? value : null;
}

/**
 * A number cell within `range()` (read when the cell is checked, so a range in the shown units
 * follows the unit switch): `{ number: true }` when it holds no number, `{ range }` outside.
 */
export function numberWithin(range: () => { min: number; max?: number }): ValidatorFn {
  return (control) => {
    const value = numberIn(String(control.value ?? ''));
    if (value === null) return { number: true };
    const { min, max = Infinity } = range();
    return value >= min && value <= max ? null : { range: { min, max } };
  };
}

/**
 * Commits a cell: a valid cell gives its value to `apply` and is shown from the draft again; a
 * cell that is invalid, or whose row's own rule refuses it (a stretch ending before it starts),
 * keeps its text and shows its message (marked touched), and nothing is applied.
 */
export function commitCell(control: AbstractControl | undefined, apply: () => void): boolean {
  if (!control) return false;
  if (control.invalid || control.parent?.errors) {
    control.markAsTouched();
    return false;
  }
  control.markAsPristine();
  apply();
  return true;
}
