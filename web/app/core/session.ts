import { HttpClient, HttpContext } from '@angular/common/http';
import { Injectable, computed, inject, signal } from '@angular/core';
import { sessionResponseSchema, userResponseSchema, type LoginRequest, type User } from '@shared/domain/auth';
import { can, type Permission } from '@shared/domain/permissions';
import { ROLE_LABELS, type Role } from '@shared/domain/roles';
import { firstValueFrom } from 'rxjs';
import { ERRORS_SHOWN_INLINE } from './api-error-message';
import { SESSION_PATH } from './early-reads';

/** Whether the first `GET /api/auth/session` has answered yet. */
export type SessionStatus = 'unknown' | 'signed-in' | 'signed-out';

/** The person signed in to this browser, as the API last told us. */
@Injectable({ providedIn: 'root' })
export class Session {
  private readonly http = inject(HttpClient);

  private readonly _user = signal<User | null>(null);
  private readonly _status = signal<SessionStatus>('unknown');
  private loading: Promise<void> | null = null;

  readonly user = this._user.asReadonly();
  readonly status = this._status.asReadonly();
  readonly role = computed<Role | null>(() => this._user()?.role ?? null);
  /**
   * Whether the signed-in person holds `permission` (shared/domain/permissions.ts, the policy the
   * API enforces). Reads the role signal, so it tracks sign-in and sign-out inside `computed`.
   */
  can(permission: Permission): boolean {
    return can(this.role(), permission);
  }

  readonly roleLabel = computed(() => {
    const role = this.role();
    return role ? ROLE_LABELS[role] : '';
  });

  /**
   * Asks the API who is signed in, once per page load; guards await this before deciding.
   * The answer is `null` when nobody is (200, so nothing is logged as a failed request).
   */
  ensureLoaded(): Promise<void> {
    this.loading ??= this.fetchCurrentUser();
    return this.loading;
  }

  /** Signs in; rejects with the HttpErrorResponse so the form can explain 401 and 429. */
  async signIn(credentials: LoginRequest): Promise<User> {
    const body = await firstValueFrom(
      this.http.post('/api/auth/login', credentials, {
        context: new HttpContext().set(ERRORS_SHOWN_INLINE, true),
      }),
    );
    const { user } = userResponseSchema.parse(body);
    this.setUser(user);
    return user;
  }

  /** Ends the session on the server, then forgets the user here whatever the answer. */
  async signOut(): Promise<void> {
    try {
      await firstValueFrom(this.http.post('/api/auth/logout', null));
    } finally {
      this.clear();
    }
  }

  /** Forgets the user locally (the server already ended the session, e.g. on a 401). */
  clear(): void {
    this._user.set(null);
    this._status.set('signed-out');
    this.loading = Promise.resolve();
  }

  private setUser(user: User): void {
    this._user.set(user);
    this._status.set('signed-in');
    this.loading = Promise.resolve();
  }

  private async fetchCurrentUser(): Promise<void> {
    try {
      const body = await firstValueFrom(this.http.get(SESSION_PATH));
      const { user } = sessionResponseSchema.parse(body);
      if (user) this.setUser(user);
      else this.clear();
    } catch (error: unknown) {
      // Expected only when the server cannot be reached: leave the person signed out; the
      // interceptor has already told them what went wrong.
      console.warn('Could not read the current session', error);
      this._user.set(null);
      this._status.set('signed-out');
    }
  }
}
