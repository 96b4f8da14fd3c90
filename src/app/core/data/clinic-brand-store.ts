import { HttpClient } from '@angular/common/http';
import { Injectable, computed, inject } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import type { Observable } from 'rxjs';
import type { ClinicBrand } from '../../../contracts/demonstrations';
import { AuthStore } from '../auth-store';
import { skipErrorSnackbar } from '../http-context';

/**
 * The signed-in user's clinic as its pages show it: name, legal details and logo (the portal's
 * header, the clinic settings). Loads once per signed-in clinic; {@link reload} after a change.
 */
@Injectable({ providedIn: 'root' })
export class ClinicBrandStore {
  private readonly http = inject(HttpClient);
  private readonly auth = inject(AuthStore);
  private readonly loaded = rxResource({
    params: () => this.auth.user()?.clinicId,
    stream: () => this.http.get<ClinicBrand>('/api/clinic/brand', { context: skipErrorSnackbar() }),
  });
  /** The brand, or null before it loads (or when nobody is signed in). */
  readonly brand = computed(() => (this.loaded.hasValue() ? (this.loaded.value() ?? null) : null));
  /** The logo URL, or null without one. */
  readonly logoUrl = computed(() => this.brand()?.logoUrl ?? null);

  reload(): void {
    this.loaded.reload();
  }

  /** Uploads a new logo (owner); refusals (4xx) are shown by the caller. */
  putLogo(file: File): Observable<ClinicBrand> {
    const body = new FormData();
    body.append('file', file, file.name);
    return this.http.put<ClinicBrand>('/api/clinic/logo', body, { context: skipErrorSnackbar() });
  }

  removeLogo(): Observable<void> {
    return this.http.delete<void>('/api/clinic/logo', { context: skipErrorSnackbar() });
  }
}
