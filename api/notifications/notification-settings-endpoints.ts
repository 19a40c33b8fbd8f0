import { eq } from 'drizzle-orm';
import { notificationSettingsSchema } from '@shared/domain/reviews';
import type { AppDeps } from '../app-deps';
import { users } from '../db/schema/index';
import { endpoint } from '../http/endpoint';
import { notificationSettingsOf } from '../reviews/review-notifications';

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
        const [row] = await deps.db
          .select({ notificationSettings: users.notificationSettings })
          .from(users)
          .where(eq(users.id, user!.id));
        res.json(notificationSettingsOf(row?.notificationSettings));
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
        const [row] = await deps.db
          .update(users)
          .set({ notificationSettings: body })
          .where(eq(users.id, user!.id))
          .returning({ notificationSettings: users.notificationSettings });
        res.json(notificationSettingsOf(row?.notificationSettings));
      },
    }),
  ];
}
