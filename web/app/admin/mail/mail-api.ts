import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { capturedMailListSchema, outgoingMailListSchema, type CapturedMail, type OutgoingMail } from '@shared/domain/mail';
import { firstValueFrom } from 'rxjs';

/** Read-only views of the mail Descentry sends, for administrators. */
@Injectable({ providedIn: 'root' })
export class MailApi {
  private readonly http = inject(HttpClient);

  async outbox(): Promise<OutgoingMail[]> {
    const body = await firstValueFrom(this.http.get('/api/mail/outbox'));
    return outgoingMailListSchema.parse(body).items;
  }

  /** What the local SMTP catcher received (development and test installations). */
  async captured(): Promise<CapturedMail[]> {
    const body = await firstValueFrom(this.http.get('/api/mail/captured'));
    return capturedMailListSchema.parse(body).items;
  }
}
