import type { AuditedKind, RestorableKind } from '@shared/domain/audit';
import type { Role } from '@shared/domain/roles';

/** Who may restore each kind: the roles that may change it (the API checks the same). */
export const RESTORERS: Readonly<Record<RestorableKind, readonly Role[]>> = {
  route: ['planner'],
  scenario: ['planner', 'analyst'],
  'vehicle-profile': ['analyst'],
  terrain: ['analyst', 'admin'],
};

/** Where the restored (or audited) thing is shown in the app. */
export function appLinkOf(kind: AuditedKind, id: string): string[] {
  switch (kind) {
    case 'route':
      return ['/routes', id];
    case 'scenario':
      return ['/scenarios', id];
    case 'vehicle-profile':
      return ['/vehicles', id];
    case 'terrain':
      return ['/terrain'];
    case 'review-item':
      return ['/reviews', id];
  }
}
