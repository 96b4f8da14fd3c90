import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, DOCUMENT, computed, inject, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Router } from '@angular/router';
import { of } from 'rxjs';
import { errorMessage } from '../../../core/api-error';
import { EmptyState } from '../../../shared/states/empty-state';
import { ErrorState } from '../../../shared/states/error-state';
import { linkify, sameOriginPath } from '../linkify';
import { MailboxApi } from '../mailbox-api';

/**
 * `/mailbox`: the demo inbox. A list of caught messages and a reading pane that shows the plain
 * text body with its web addresses as links (never the HTML body).
 */
@Component({
  selector: 'app-mailbox-page',
  imports: [
    DatePipe,
    MatCardModule,
    MatButtonModule,
    MatIconModule,
    MatProgressBarModule,
    EmptyState,
    ErrorState,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './mailbox-page.html',
  styleUrl: './mailbox-page.scss',
})
export class MailboxPage {
  private readonly api = inject(MailboxApi);
  private readonly router = inject(Router);
  private readonly origin = inject(DOCUMENT).location.origin;

  protected readonly messages = rxResource({ stream: () => this.api.list() });
  protected readonly selectedId = signal<number | null>(null);
  protected readonly message = rxResource({
    params: () => this.selectedId() ?? undefined,
    stream: ({ params }) => (params ? this.api.get(params) : of(null)),
  });
  protected readonly segments = computed(() => {
    const m = this.message.hasValue() ? this.message.value() : null;
    return m ? linkify(m.text) : [];
  });
  protected readonly errorMessage = errorMessage;

  protected select(id: number): void {
    this.selectedId.set(id);
  }

  protected refresh(): void {
    this.messages.reload();
  }

  /** Links into this app open in place; others open normally. */
  protected follow(event: MouseEvent, href: string): void {
    const path = sameOriginPath(href, this.origin);
    if (!path || event.ctrlKey || event.metaKey || event.shiftKey || event.button !== 0) return;
    event.preventDefault();
    void this.router.navigateByUrl(path);
  }
}
