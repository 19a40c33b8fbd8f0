import { HttpClient, HttpContext } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { tokenInfoResponseSchema, type ChangePasswordRequest, type TokenInfoResponse } from '@shared/domain/auth';
import { firstValueFrom } from 'rxjs';
import { ERRORS_SHOWN_INLINE } from './api-error-message';

/** Which e-mailed link brought the person here. */
export type AccountTokenKind = TokenInfoResponse['kind'];

const inline = () => ({ context: new HttpContext().set(ERRORS_SHOWN_INLINE, true) });

/**
 * Account endpoints outside the session itself: e-mailed invitation and reset links, and
 * changing one's own password. Every caller explains failures inline, so no snack bars.
 */
@Injectable({ providedIn: 'root' })
export class AccountApi {
  private readonly http = inject(HttpClient);

  /** Who an e-mailed token belongs to; 404/410 when it is unknown, expired or already used. */
  async tokenInfo(token: string): Promise<TokenInfoResponse> {
    const body = await firstValueFrom(this.http.post('/api/auth/token-info', { token }, inline()));
    return tokenInfoResponseSchema.parse(body);
  }

  /** Sets the first password from an invitation (answers 204). */
  async acceptInvitation(token: string, password: string): Promise<void> {
    await firstValueFrom(this.http.post('/api/auth/invitations/accept', { token, password }, inline()));
  }

  /** Sets a new password from a reset link (answers 204). */
  async confirmPasswordReset(token: string, password: string): Promise<void> {
    await firstValueFrom(this.http.post('/api/auth/password-reset/confirm', { token, password }, inline()));
  }

  /** Asks for a reset link; answers 202 whether or not the address is known. */
  async requestPasswordReset(email: string): Promise<void> {
    await firstValueFrom(this.http.post('/api/auth/password-reset/request', { email }, inline()));
  }

  /** Changes the signed-in person's password (204); the server then ends all their sessions. */
  async changePassword(request: ChangePasswordRequest): Promise<void> {
    await firstValueFrom(this.http.post('/api/auth/password', request, inline()));
  }
}
