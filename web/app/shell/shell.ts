import { BreakpointObserver } from '@angular/cdk/layout';
import { ChangeDetectionStrategy, Component, computed, inject, viewChild } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatDividerModule } from '@angular/material/divider';
import { MatIconModule } from '@angular/material/icon';
import { MatListModule } from '@angular/material/list';
import { MatMenuModule } from '@angular/material/menu';
import { MatSidenav, MatSidenavModule } from '@angular/material/sidenav';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatToolbarModule } from '@angular/material/toolbar';
import { Router, RouterLink, RouterLinkActive, RouterOutlet } from '@angular/router';
import { map } from 'rxjs';
import { areasFor, type AreaLink } from '../core/areas';
import { Session } from '../core/session';
import { BrandMark } from '../ui/brand-mark';

/** Below this width the side navigation becomes an overlay opened from the top bar. */
const OVERLAY_NAV_QUERY = '(max-width: 1023.98px)';

interface NavGroup {
  heading: string | null;
  links: AreaLink[];
}

/** The frame around every signed-in page: top bar, side navigation, account menu. */
@Component({
  selector: 'app-shell',
  imports: [
    RouterOutlet,
    RouterLink,
    RouterLinkActive,
    MatToolbarModule,
    MatSidenavModule,
    MatListModule,
    MatIconModule,
    MatButtonModule,
    MatMenuModule,
    MatDividerModule,
    BrandMark,
  ],
  templateUrl: './shell.html',
  styleUrl: './shell.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class Shell {
  private readonly session = inject(Session);
  private readonly router = inject(Router);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);

  private readonly sidenav = viewChild.required(MatSidenav);

  protected readonly user = this.session.user;
  protected readonly roleLabel = this.session.roleLabel;
  protected readonly isOverlayNav = toSignal(
    inject(BreakpointObserver)
      .observe(OVERLAY_NAV_QUERY)
      .pipe(map((state) => state.matches)),
    { initialValue: false },
  );
  protected readonly navGroups = computed<NavGroup[]>(() => groupLinks(areasFor(this.router.config, this.session.role())));

  protected closeNavIfOverlay(): void {
    if (this.isOverlayNav()) void this.sidenav().close();
  }

  protected async openChangePassword(): Promise<void> {
    // The dialog brings the forms package with it: load it only when someone asks for it.
    const { ChangePasswordDialog } = await import('../account/change-password-dialog');
    this.dialog
      .open(ChangePasswordDialog, { width: '440px', maxWidth: '95vw', autoFocus: 'first-tabbable' })
      .afterClosed()
      .subscribe((changed: unknown) => {
        if (changed === true) void this.endSessionAfterPasswordChange();
      });
  }

  protected async openNotificationSettings(): Promise<void> {
    const { NotificationSettingsDialog } = await import('../account/notification-settings-dialog');
    this.dialog
      .open(NotificationSettingsDialog, { width: '520px', maxWidth: '95vw', autoFocus: 'first-tabbable' })
      .afterClosed()
      .subscribe((saved: unknown) => {
        if (saved === true) this.snackBar.open('Notification settings saved.', 'OK');
      });
  }

  protected async signOut(): Promise<void> {
    try {
      await this.session.signOut();
    } catch {
      // Expected when the server is unreachable or the session already ended; the snack bar has
      // said so and the local session is cleared either way.
    }
    await this.router.navigate(['/sign-in'], { queryParams: { notice: 'signed-out' } });
  }

  private async endSessionAfterPasswordChange(): Promise<void> {
    // The server has ended every session of this person, this one included.
    this.session.clear();
    await this.router.navigate(['/sign-in'], { queryParams: { notice: 'password-changed' } });
  }
}

function groupLinks(links: AreaLink[]): NavGroup[] {
  const groups: NavGroup[] = [];
  for (const link of links) {
    const heading = link.group ?? null;
    let group = groups.find((candidate) => candidate.heading === heading);
    if (!group) {
      group = { heading, links: [] };
      if (heading === null) groups.unshift(group);
      else groups.push(group);
    }
    group.links.push(link);
  }
  return groups;
}
