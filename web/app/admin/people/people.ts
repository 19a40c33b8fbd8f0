import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, viewChild } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatMenuModule } from '@angular/material/menu';
import { MatPaginator, MatPaginatorModule } from '@angular/material/paginator';
import { MatSelectModule } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatSort, MatSortModule } from '@angular/material/sort';
import { MatTableModule } from '@angular/material/table';
import { PERSON_STATUSES, type Person } from '@shared/domain/people';
import { ROLES, ROLE_LABELS, type Role } from '@shared/domain/roles';
import { Session } from '../../core/session';
import { InvitePersonDialog } from './invite-person-dialog';
import { PeopleApi } from './people-api';
import { NO_PEOPLE_FILTER, matchesPeopleFilter } from './people-filter';
import { filterOf, listTable } from '../../ui/list-table';
import { LoadStatus } from '../../ui/load-status';

const STATUS_LABELS: Readonly<Record<Person['status'], string>> = {
  invited: 'Invited',
  active: 'Active',
  disabled: 'Disabled',
};

/** Administrators' list of everyone with a Descentry account. */
@Component({
  selector: 'app-people',
  imports: [
    LoadStatus,
    DatePipe,
    ReactiveFormsModule,
    MatTableModule,
    MatSortModule,
    MatPaginatorModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatButtonModule,
    MatIconModule,
    MatMenuModule,
  ],
  templateUrl: './people.html',
  styleUrl: './people.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class People {
  private readonly peopleApi = inject(PeopleApi);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  private readonly session = inject(Session);

  private readonly sort = viewChild.required(MatSort);
  private readonly paginator = viewChild.required(MatPaginator);

  protected readonly roles = ROLES;
  protected readonly roleLabels = ROLE_LABELS;
  protected readonly statuses = PERSON_STATUSES;
  protected readonly statusLabels = STATUS_LABELS;
  protected readonly columns = ['name', 'role', 'status', 'lastSignInAt', 'actions'];

  protected readonly filterForm = new FormGroup({
    text: new FormControl('', { nonNullable: true }),
    role: new FormControl<Role | ''>('', { nonNullable: true }),
    status: new FormControl<Person['status'] | ''>('', { nonNullable: true }),
  });
  protected readonly table = listTable({
    load: () => this.peopleApi.list(),
    filter: filterOf(this.filterForm, NO_PEOPLE_FILTER),
    matches: matchesPeopleFilter,
    sort: this.sort,
    paginator: this.paginator,
  });
  protected readonly ownId = computed(() => this.session.user()?.id);

  protected statusLabel(status: Person['status']): string {
    return STATUS_LABELS[status];
  }

  protected clearFilter(): void {
    this.filterForm.reset();
  }

  protected openInvite(): void {
    this.dialog
      .open(InvitePersonDialog, { width: '480px', maxWidth: '95vw' })
      .afterClosed()
      .subscribe((person: Person | undefined) => {
        if (!person) return;
        this.table.rows.update((people) => [person, ...people.filter((p) => p.id !== person.id)]);
        this.snackBar.open(`Invitation sent to ${person.email}.`, 'OK');
      });
  }

  protected async changeRole(person: Person, role: Role): Promise<void> {
    if (role === person.role) return;
    await this.applyUpdate(person, { role }, `${person.name} is now: ${ROLE_LABELS[role]}.`);
  }

  protected async setEnabled(person: Person, enabled: boolean): Promise<void> {
    const message = enabled ? `${person.name} can sign in again.` : `${person.name} can no longer sign in.`;
    await this.applyUpdate(person, { status: enabled ? 'active' : 'disabled' }, message);
  }

  /** Ends the wait that failed sign-ins put on the account (the person may be locked out by someone else's guesses). */
  protected async liftSignInLimit(person: Person): Promise<void> {
    try {
      this.replacePerson(await this.peopleApi.liftSignInLimit(person.id));
      this.snackBar.open(`${person.name} can sign in again without waiting.`, 'OK');
    } catch {
      // Expected: the interceptor has shown the API's reason in a snack bar.
    }
  }

  protected async sendPasswordReset(person: Person): Promise<void> {
    try {
      await this.peopleApi.sendPasswordReset(person.id);
      this.snackBar.open(`A password reset link is on its way to ${person.email}.`, 'OK');
    } catch {
      // Expected: the interceptor has shown the API's reason in a snack bar.
    }
  }

  private async applyUpdate(person: Person, update: { role?: Role; status?: 'active' | 'disabled' }, message: string): Promise<void> {
    try {
      const updated = await this.peopleApi.update(person.id, update);
      this.replacePerson(updated);
      this.snackBar.open(message, 'OK');
    } catch {
      // Expected: the interceptor has shown the API's reason; put the row back as it was.
      this.replacePerson(person);
    }
  }

  private replacePerson(person: Person): void {
    this.table.rows.update((people) => people.map((p) => (p.id === person.id ? { ...person } : p)));
  }
}
