import { HttpClient, HttpContext } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { personListSchema, personSchema, type InviteRequest, type Person, type UpdatePersonRequest } from '@shared/domain/people';
import { firstValueFrom } from 'rxjs';
import { ERRORS_SHOWN_INLINE } from '../../core/api-error-message';

/** The administrator's people endpoints; every answer is parsed with the shared schemas. */
@Injectable({ providedIn: 'root' })
export class PeopleApi {
  private readonly http = inject(HttpClient);

  async list(): Promise<Person[]> {
    return personListSchema.parse(await firstValueFrom(this.http.get('/api/people'))).items;
  }

  /** Invites a person (201); the invitation e-mail goes out through the outbox. Errors inline. */
  async invite(request: InviteRequest): Promise<Person> {
    const body = await firstValueFrom(
      this.http.post('/api/people', request, {
        context: new HttpContext().set(ERRORS_SHOWN_INLINE, true),
      }),
    );
    return personSchema.parse(body);
  }

  async update(personId: string, update: UpdatePersonRequest): Promise<Person> {
    const body = await firstValueFrom(this.http.patch(`/api/people/${encodeURIComponent(personId)}`, update));
    return personSchema.parse(body);
  }

  /** Lifts the slow-down failed sign-ins put on the account; answers the person as they are now. */
  async liftSignInLimit(personId: string): Promise<Person> {
    const body = await firstValueFrom(this.http.post(`/api/people/${encodeURIComponent(personId)}/unblock-sign-in`, null));
    return personSchema.parse(body);
  }

  /** Sends the person a password reset link (202). */
  async sendPasswordReset(personId: string): Promise<void> {
    await firstValueFrom(this.http.post(`/api/people/${encodeURIComponent(personId)}/password-reset`, null));
  }
}
