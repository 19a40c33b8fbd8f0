import { computed, effect, linkedSignal, resource, type Signal, type WritableSignal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import type { FormGroup } from '@angular/forms';
import type { MatPaginator } from '@angular/material/paginator';
import type { MatSort } from '@angular/material/sort';
import { MatTableDataSource } from '@angular/material/table';
import { debounceTime, map, type Observable } from 'rxjs';
import { loadStateOf, type LoadState } from './load-state';

/**
 * The filter form above a list as a signal holding every field: the form's value over `empty`
 * (a reset form gives `empty` back), optionally after a pause in typing. Call in an injection
 * context (a field initialiser).
 */
export function filterOf<Filter extends object>(form: FormGroup, empty: Filter, options: { debounceMs?: number } = {}): Signal<Filter> {
  const whole = (value: Partial<Filter>): Filter => ({ ...empty, ...value });
  const changes = form.valueChanges as Observable<Partial<Filter>>;
  const paced = options.debounceMs ? changes.pipe(debounceTime(options.debounceMs)) : changes;
  return toSignal(paced.pipe(map(whole)), { initialValue: whole(form.getRawValue() as Partial<Filter>) });
}

/** What a page hands `listTable`: how to load the rows, the filter and its test, and the table's sort and pager. */
export interface ListTableOptions<Row, Filter> {
  /** All rows of the list (the server answers the whole list; filtering, sorting and paging happen here). */
  load: () => Promise<Row[]>;
  filter: Signal<Filter>;
  matches: (row: Row, filter: Filter) => boolean;
  /** The table's sort and pager (undefined while the table is not on the page). */
  sort: Signal<MatSort | undefined>;
  paginator: Signal<MatPaginator | undefined>;
  /** The value a column sorts by, where it is not the row's field of the column's name. */
  sortValue?: (row: Row, column: string) => string | number;
}

/** A list loaded whole and shown in a Material table: see `listTable`. */
export interface ListTable<Row> {
  /** The rows as loaded, then as the page changed them (a person invited, a role changed). */
  readonly rows: WritableSignal<Row[]>;
  /** The rows that pass the filter, in the order loaded (the table sorts and pages them). */
  readonly visibleRows: Signal<Row[]>;
  readonly loadState: Signal<LoadState<Row[]>>;
  readonly dataSource: MatTableDataSource<Row>;
  /** Loads the list again (the "Try again" of the load-status line). */
  reload(): void;
}

/**
 * One list page's table logic: the rows load through a resource (loading, failure in words,
 * Try again), the filter narrows them, and a `MatTableDataSource` sorts and pages what is left;
 * a change of filter goes back to the first page. Columns, wording and row actions stay with the
 * page. Call in an injection context (a field initialiser).
 */
export function listTable<Row, Filter>(options: ListTableOptions<Row, Filter>): ListTable<Row> {
  const data = resource({ loader: () => options.load() });
  const rows = linkedSignal<Row[]>(() => (data.hasValue() ? data.value() : []));
  const visibleRows = computed(() => {
    const filter = options.filter();
    return rows().filter((row) => options.matches(row, filter));
  });
  const dataSource = new MatTableDataSource<Row>([]);
  if (options.sortValue) dataSource.sortingDataAccessor = options.sortValue;
  // MatTableDataSource is not signal-based: hand it the sort, the pager and the filtered rows.
  effect(() => {
    dataSource.sort = options.sort() ?? null;
    dataSource.paginator = options.paginator() ?? null;
    dataSource.data = visibleRows();
  });
  // A narrower filter may leave fewer pages than the one shown: start again from the first.
  let firstFilter = true;
  effect(() => {
    options.filter();
    if (firstFilter) {
      firstFilter = false;
      return;
    }
    options.paginator()?.firstPage();
  });
  return { rows, visibleRows, loadState: loadStateOf(data), dataSource, reload: () => data.reload() };
}
