import { notificationSettingsSchema } from '@shared/domain/reviews';
import type { AppDeps } from '../app-deps';
import { endpoint } from '../http/endpoint';
import { notificationSettingsOf } from '../reviews/review-notifications';
import { findNotificationSettings, saveNotificationSettings } from './notification-settings-repository';

/** The signed-in person's e-mail switches (stored in users.notification_settings). */
export function notificationSettingsEndpoints(deps: AppDeps) {
  return [
    endpoint({
      method: 'get',
      path: '/api/me/notifications',
      summary: 'Your e-mail notification switches',
      tag: 'Notifications',
      access: 'signed-in',
      responses: { 200: { description: 'Switches (unset ones are on)', schema: notificationSettingsSchema } },
      handler: async ({ user, res }) => {
        res.json(notificationSettingsOf(await findNotificationSettings(deps.db, user!.id)));
      },
    }),
    endpoint({
      method: 'put',
      path: '/api/me/notifications',
      summary: 'Turn your e-mail notifications on or off',
      tag: 'Notifications',
      access: 'signed-in',
      body: notificationSettingsSchema.strict(),
      responses: { 200: { description: 'Saved switches', schema: notificationSettingsSchema } },
      handler: async ({ body, user, res }) => {
        res.json(notificationSettingsOf(await saveNotificationSettings(deps.db, user!.id, body)));
      },
    }),
  ];
}
