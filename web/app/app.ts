import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatIconRegistry } from '@angular/material/icon';
import { RouterOutlet } from '@angular/router';

/** Root of the application: everything below it is chosen by the router. */
@Component({
  selector: 'app-root',
  imports: [RouterOutlet],
  template: '<router-outlet />',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class App {
  constructor() {
    // Icons come from the bundled Material Symbols font, not the default ligature font.
    inject(MatIconRegistry).setDefaultFontSetClass('material-symbols-outlined');
  }
}
