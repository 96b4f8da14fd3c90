import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import type { ClinicLegalDetails } from '../../../contracts/billing';
import { skipErrorSnackbar } from '../../core/http-context';

/** HTTP for the owner's clinic settings: the legal details invoices and receipts carry. */
@Injectable({ providedIn: 'root' })
export class ClinicSettingsApi {
  private readonly http = inject(HttpClient);

  legalDetails(): Observable<ClinicLegalDetails> {
    return this.http.get<ClinicLegalDetails>('/api/clinic/legal-details', { context: skipErrorSnackbar() });
  }

  /** Saves them; 422 field errors are shown inline by the form. */
  putLegalDetails(body: ClinicLegalDetails): Observable<ClinicLegalDetails> {
    return this.http.put<ClinicLegalDetails>('/api/clinic/legal-details', body, { context: skipErrorSnackbar(422) });
  }
}
