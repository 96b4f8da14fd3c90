import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable, map } from 'rxjs';
import type { MailboxMessage, MailboxMessageSummary } from '../../../contracts/api';
import { skipErrorSnackbar } from '../../core/http-context';

/** The demo mailbox: e-mails the app "sent", caught by the local fake SMTP (owner, demo mode). */
@Injectable({ providedIn: 'root' })
export class MailboxApi {
  private readonly http = inject(HttpClient);

  /** Newest first. */
  list(): Observable<MailboxMessageSummary[]> {
    return this.http
      .get<{ messages: MailboxMessageSummary[] }>('/api/mailbox', { context: skipErrorSnackbar() })
      .pipe(map((r) => r.messages));
  }

  get(id: number): Observable<MailboxMessage> {
    return this.http.get<MailboxMessage>(`/api/mailbox/${id}`, { context: skipErrorSnackbar() });
  }
}
