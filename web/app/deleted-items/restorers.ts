import type { AuditedKind } from '@shared/domain/audit';

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
    case 'service-day':
      return ['/service-days', id];
  }
}
