import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable, map } from 'rxjs';
import type { InvitationPreview, SessionUser } from '../../contracts/api';
import { skipErrorSnackbar } from './http-context';

/**
 * HTTP calls for sessions, password changes, invitations and password resets. Every call here reports its errors
 * inline on the page that makes it, so none of them raise the global error snackbar.
 */
@Injectable({ providedIn: 'root' })
export class AuthApi {
  private readonly http = inject(HttpClient);

  /**
   * The signed-in user, or null. The contract answers 401 when there is no session; a
   * `{ user: null }` answer is accepted as "signed out" too.
   */
  me(): Observable<SessionUser | null> {
    return this.http.get<{ user: SessionUser | null }>('/api/auth/me', { context: skipErrorSnackbar() }).pipe(map((r) => r?.user ?? null));
  }

  /** Makes sure the readable `XSRF-TOKEN` cookie exists before any state-changing request. */
  csrf(): Observable<void> {
    return this.http.get<{ token: string }>('/api/auth/csrf', { context: skipErrorSnackbar() }).pipe(map(() => undefined));
  }

  signIn(email: string, password: string): Observable<SessionUser> {
    return this.http
      .post<{ user: SessionUser }>('/api/auth/sign-in', { email, password }, { context: skipErrorSnackbar() })
      .pipe(map((r) => r.user));
  }

  signOut(): Observable<void> {
    return this.http.post<void>('/api/auth/sign-out', null, { context: skipErrorSnackbar() }).pipe(map(() => undefined));
  }

  previewInvitation(token: string): Observable<InvitationPreview> {
    return this.http.get<InvitationPreview>(`/api/invitations/${encodeURIComponent(token)}`, {
      context: skipErrorSnackbar(),
    });
  }

  acceptInvitation(token: string, body: { name: string; password: string }): Observable<SessionUser> {
    return this.http
      .post<{ user: SessionUser }>(`/api/invitations/${encodeURIComponent(token)}/accept`, body, { context: skipErrorSnackbar() })
      .pipe(map((r) => r.user));
  }

  /**
   * Changes the signed-in person's password; the server ends their other sessions and answers the
   * user of this browser's new session.
   */
  changePassword(currentPassword: string, newPassword: string): Observable<SessionUser> {
    return this.http
      .post<{ user: SessionUser }>('/api/auth/password', { currentPassword, newPassword }, { context: skipErrorSnackbar() })
      .pipe(map((r) => r.user));
  }

  requestPasswordReset(email: string): Observable<void> {
    return this.http.post<void>('/api/password-resets', { email }, { context: skipErrorSnackbar() }).pipe(map(() => undefined));
  }

  previewPasswordReset(token: string): Observable<{ email: string }> {
    return this.http.get<{ email: string }>(`/api/password-resets/${encodeURIComponent(token)}`, { context: skipErrorSnackbar() });
  }

  resetPassword(token: string, password: string): Observable<void> {
    return this.http
      .post<void>(`/api/password-resets/${encodeURIComponent(token)}`, { password }, { context: skipErrorSnackbar() })
      .pipe(map(() => undefined));
  }
}
