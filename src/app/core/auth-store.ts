import { Injectable, computed, inject, signal } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { SessionUser } from '../../contracts/api';
import { AuthApi } from './auth-api';
import { homePathFor } from './roles';

/**
 * The signed-in user as signals. `load()` runs once at startup (see `app.config.ts`); pages call
 * `signIn`, `signOut` and `setUser`; the error interceptor calls `clear()` when a session ends.
 */
@Injectable({ providedIn: 'root' })
export class AuthStore {
  private readonly api = inject(AuthApi);
  private readonly current = signal<SessionUser | null>(null);

  /** The signed-in user, or null. */
  readonly user = this.current.asReadonly();
  readonly role = computed(() => this.current()?.role ?? null);
  readonly isSignedIn = computed(() => this.current() !== null);
  /** Owners and coaches. */
  readonly isStaff = computed(() => this.role() === 'owner' || this.role() === 'coach');
  /** Whether the signed-in user is the clinic owner (billing, team, settings). */
  readonly isOwner = computed(() => this.role() === 'owner');
  /** Where this user lands when opening `/`. */
  readonly homePath = computed(() => homePathFor(this.role()));

  /** Asks the server who is signed in; any failure leaves the app signed out. */
  async load(): Promise<void> {
    try {
      this.current.set(await firstValueFrom(this.api.me()));
    } catch {
      this.current.set(null);
    }
  }

  /** Same as `load`; used after something may have changed the session elsewhere. */
  refresh(): Promise<void> {
    return this.load();
  }

  /** Makes sure an XSRF cookie exists; failures are ignored (the next mutation will report). */
  async ensureCsrf(): Promise<void> {
    try {
      await firstValueFrom(this.api.csrf());
    } catch {
      // Nothing to do: a missing cookie shows up as a 403 on the next state-changing request.
    }
  }

  /**
   * After a request was refused for a stale CSRF token: fetches a fresh token and answers whether
   * the session now belongs to nobody or to the same user as this page (then the request may be sent
   * again). False when someone else signed in meanwhile (a shared computer): this page's change must
   * not be made in their name.
   */
  async refreshCsrfForSameUser(): Promise<boolean> {
    await this.ensureCsrf();
    let now: SessionUser | null;
    try {
      now = await firstValueFrom(this.api.me());
    } catch {
      return true; // Unknown: the resend is checked by the server as any request is.
    }
    return now === null || now.id === this.current()?.id;
  }

  /** Signs in; rejects with the `HttpErrorResponse` (401 bad credentials, 429 rate limited). */
  async signIn(email: string, password: string): Promise<SessionUser> {
    const user = await firstValueFrom(this.api.signIn(email, password));
    this.current.set(user);
    // The session is new, so fetch a token bound to it before the next mutation.
    await this.ensureCsrf();
    return user;
  }

  /** Signs out on the server (best effort) and forgets the user locally. */
  async signOut(): Promise<void> {
    try {
      await firstValueFrom(this.api.signOut());
    } catch {
      // Signed out locally either way.
    }
    this.current.set(null);
    await this.ensureCsrf();
  }

  /** Sets the user after the server created a session some other way (accepting an invitation). */
  async setUser(user: SessionUser): Promise<void> {
    this.current.set(user);
    await this.ensureCsrf();
  }

  /** Forgets the user without calling the server (the session has already ended). */
  clear(): void {
    this.current.set(null);
  }
}
