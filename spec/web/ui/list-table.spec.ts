import { ChangeDetectionStrategy, Component, viewChild } from '@angular/core';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { FormControl, FormGroup } from '@angular/forms';
import { MatPaginator, MatPaginatorModule } from '@angular/material/paginator';
import { MatSort, MatSortModule } from '@angular/material/sort';
import { MatTableModule } from '@angular/material/table';
import { filterOf, listTable } from '../../../web/app/ui/list-table';
import { settle } from '../support/settle';

interface Stop {
  name: string;
  town: string;
}

const NO_FILTER = { town: '' };

/** Eight stops in two towns, three to a page. */
const STOPS: Stop[] = [
  ...['Church', 'Mill', 'Bridge', 'School', 'Depot'].map((name) => ({ name, town: 'Korvel' })),
  ...['Square', 'Station', 'Lifts'].map((name) => ({ name, town: 'Orren' })),
];

@Component({
  selector: 'app-stop-list-host',
  imports: [MatTableModule, MatSortModule, MatPaginatorModule],
  template: `
    <table mat-table [dataSource]="table.dataSource" matSort>
      <ng-container matColumnDef="name">
        <th mat-header-cell *matHeaderCellDef mat-sort-header>Name</th>
        <td mat-cell *matCellDef="let stop">{{ stop.name }}</td>
      </ng-container>
      <tr mat-header-row *matHeaderRowDef="['name']"></tr>
      <tr mat-row *matRowDef="let stop; columns: ['name']"></tr>
    </table>
    <mat-paginator [pageSize]="3" />
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
class StopListHost {
  readonly form = new FormGroup({ town: new FormControl('', { nonNullable: true }) });
  private readonly sort = viewChild.required(MatSort);
  readonly paginator = viewChild.required(MatPaginator);
  loads = 0;
  // A fresh array per answer, as a parsed HTTP answer is.
  answer: () => Promise<Stop[]> = () => Promise.resolve([...STOPS]);
  readonly table = listTable({
    load: () => {
      this.loads += 1;
      return this.answer();
    },
    filter: filterOf(this.form, NO_FILTER),
    matches: (stop: Stop, filter: typeof NO_FILTER) => !filter.town || stop.town === filter.town,
    sort: this.sort,
    paginator: this.paginator,
  });
}

describe('listTable', () => {
  it('shows the first page of the loaded rows and counts the ones that pass the filter', async () => {
    const fixture = await render();

    expect(shownNames(fixture)).toEqual(['Church', 'Mill', 'Bridge']);
    expect(fixture.componentInstance.table.rows()).toHaveLength(8);
    expect(fixture.componentInstance.table.loadState().status).toBe('ready');
  });

  it('goes back to the first page when the filter changes', async () => {
    const fixture = await render();
    fixture.componentInstance.paginator().lastPage();
    await settle(fixture);
    expect(shownNames(fixture)).toEqual(['Station', 'Lifts']);

    fixture.componentInstance.form.setValue({ town: 'Korvel' });
    await settle(fixture);

    expect(fixture.componentInstance.paginator().pageIndex).toBe(0);
    expect(shownNames(fixture)).toEqual(['Church', 'Mill', 'Bridge']);
    expect(fixture.componentInstance.table.visibleRows()).toHaveLength(5);
  });

  it('gives every row back when the filter form is reset', async () => {
    const fixture = await render();
    fixture.componentInstance.form.setValue({ town: 'Orren' });
    await settle(fixture);
    expect(fixture.componentInstance.table.visibleRows()).toHaveLength(3);

    fixture.componentInstance.form.reset();
    await settle(fixture);

    expect(fixture.componentInstance.table.visibleRows()).toHaveLength(8);
  });

  it('keeps a row the page changed, and loads the list again on reload', async () => {
    const fixture = await render();
    fixture.componentInstance.table.rows.update((rows) => [{ name: 'Abbey', town: 'Korvel' }, ...rows]);
    await settle(fixture);
    expect(shownNames(fixture)[0]).toBe('Abbey');

    fixture.componentInstance.table.reload();
    await settle(fixture);

    expect(fixture.componentInstance.loads).toBe(2);
    expect(shownNames(fixture)[0]).toBe('Church');
  });

  it('reports a failed load as an error in words, and loads again on reload', async () => {
    TestBed.configureTestingModule({});
    const fixture = TestBed.createComponent(StopListHost);
    fixture.componentInstance.answer = () => Promise.reject(new Error('The server could not be reached'));
    fixture.detectChanges();
    await settle(fixture);
    expect(fixture.componentInstance.table.loadState().status).toBe('error');

    fixture.componentInstance.answer = () => Promise.resolve([...STOPS]);
    fixture.componentInstance.table.reload();
    await settle(fixture);

    expect(fixture.componentInstance.table.loadState().status).toBe('ready');
    expect(shownNames(fixture)).toEqual(['Church', 'Mill', 'Bridge']);
  });
});

async function render(): Promise<ComponentFixture<StopListHost>> {
  TestBed.configureTestingModule({});
  const fixture = TestBed.createComponent(StopListHost);
  fixture.detectChanges();
  await settle(fixture);
  await settle(fixture);
  return fixture;
}

function shownNames(fixture: ComponentFixture<StopListHost>): string[] {
  const cells = (fixture.nativeElement as HTMLElement).querySelectorAll('td.mat-mdc-cell');
  return [...cells].map((cell) => (cell.textContent ?? '').trim());
}
