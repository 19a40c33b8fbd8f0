import { ChangeDetectionStrategy, Component } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { RouterLink } from '@angular/router';

/** Shown for addresses that do not exist or that the person's role may not open. */
@Component({
  selector: 'app-not-found',
  imports: [RouterLink, MatButtonModule],
  template: `
    <section class="app-page">
      <h1 class="app-page-title">Page not found</h1>
      <p class="app-lead">
        This address does not lead to a page you can open. It may have been mistyped, or it belongs to an area your role does not use.
      </p>
      <a matButton="filled" routerLink="/">Go to your home page</a>
    </section>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class NotFound {}
