import { HttpClient, HttpContext } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { notificationSettingsSchema, type NotificationSettings } from '@shared/domain/reviews';
import { firstValueFrom } from 'rxjs';
import { ERRORS_SHOWN_INLINE } from '../core/api-error-message';

/** The signed-in person's e-mail notification switches. */
@Injectable({ providedIn: 'root' })
export class NotificationsApi {
  private readonly http = inject(HttpClient);

  async get(): Promise<NotificationSettings> {
    return notificationSettingsSchema.parse(await firstValueFrom(this.http.get('/api/me/notifications')));
  }

  async save(settings: NotificationSettings): Promise<NotificationSettings> {
    const body = await firstValueFrom(
      this.http.put('/api/me/notifications', settings, { context: new HttpContext().set(ERRORS_SHOWN_INLINE, true) }),
    );
    return notificationSettingsSchema.parse(body);
  }
}
