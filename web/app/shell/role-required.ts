import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import { ROLE_LABELS, type Role } from '@shared/domain/roles';
import { Session } from '../core/session';

/**
 * What a page such as "New route" shows to a role that may read the area but not create in it
 * (a bookmarked or typed address): who may do it, and the way back to the list. The route's
 * `data` gives `action`, `roles`, `back` and `backLabel`.
 */
@Component({
  selector: 'app-role-required',
  imports: [RouterLink, MatButtonModule, MatIconModule],
  template: `
    <section class="app-page" data-testid="role-required">
      <h1 class="app-page-title">{{ title() }}</h1>
      <p class="app-lead">
        Only {{ allowed() }} can {{ action() }}. You are signed in as {{ roleLabel() }}, so this page has nothing for you to do; you can
        still open everything in {{ backLabel() }}.
      </p>
      <a matButton="filled" [routerLink]="back()"><mat-icon>arrow_back</mat-icon> {{ backLabel() }}</a>
    </section>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class RoleRequired {
  private readonly session = inject(Session);

  /** Bound from the route's data (withComponentInputBinding). */
  readonly title = input('Not for your role');
  readonly action = input.required<string>();
  readonly roles = input.required<readonly Role[]>();
  readonly back = input.required<string>();
  readonly backLabel = input.required<string>();

  protected readonly roleLabel = computed(() => this.session.roleLabel().toLowerCase() || 'someone else');
  protected readonly allowed = computed(() => {
    const labels = this.roles().map((role) => `${ROLE_LABELS[role].toLowerCase()}s`);
    return labels.length > 1 ? `${labels.slice(0, -1).join(', ')} and ${labels.at(-1)}` : (labels[0] ?? '');
  });
}
