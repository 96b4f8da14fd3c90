import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDatepickerModule } from '@angular/material/datepicker';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatTableModule } from '@angular/material/table';
import { RouterLink } from '@angular/router';
import { INVOICE_STATUSES, type InvoiceQuery, type InvoiceStatus } from '../../../../contracts/billing';
import { errorMessage } from '../../../core/api-error';
import { toIsoDate } from '../../../shared/dates';
import { EmptyState } from '../../../shared/states/empty-state';
import { ErrorState } from '../../../shared/states/error-state';
import { AthletesApi } from '../../../core/data/athletes-api';
import { BillingApi } from '../../../core/data/billing-api';
import { money, STATUS_WORDS } from '../../../shared/billing-words';
import { InvoiceStatusBadge } from '../invoice-status/invoice-status';

/** `/billing/invoices` (owner): the clinic's invoices, filtered by status, athlete and date, with totals. */
@Component({
  selector: 'app-invoice-list',
  imports: [
    DatePipe,
    FormsModule,
    RouterLink,
    MatTableModule,
    MatDatepickerModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatButtonModule,
    MatIconModule,
    MatProgressBarModule,
    ErrorState,
    EmptyState,
    InvoiceStatusBadge,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './invoice-list.html',
  styleUrl: './invoice-list.scss',
})
export class InvoiceList {
  private readonly api = inject(BillingApi);
  private readonly athletesApi = inject(AthletesApi);

  protected readonly status = signal<InvoiceStatus | ''>('');
  protected readonly athleteId = signal<number | null>(null);
  /** Creation-date filter (datepicker values; null = no limit, an unparsable entry counts as none). */
  protected readonly from = signal<Date | null>(null);
  protected readonly to = signal<Date | null>(null);
  private readonly query = computed<InvoiceQuery>(() => ({
    status: this.status() || undefined,
    athleteId: this.athleteId() ?? undefined,
    from: toIsoDate(this.from()) ?? undefined,
    to: toIsoDate(this.to()) ?? undefined,
  }));
  protected readonly list = rxResource({ params: () => this.query(), stream: ({ params }) => this.api.invoices(params) });
  protected readonly athletes = rxResource({ stream: () => this.athletesApi.list() });
  /** The athlete filter's choices (a resource in error throws from value(): read only when loaded). */
  protected readonly athleteOptions = computed(() => (this.athletes.hasValue() ? this.athletes.value() : []));
  protected readonly statuses = INVOICE_STATUSES;
  protected readonly words = STATUS_WORDS;
  protected readonly columns = ['number', 'athlete', 'status', 'created', 'due', 'total'];
  protected readonly money = money;
  protected readonly errorMessage = errorMessage;
  /** Whether any filter is set. */
  protected readonly filtered = computed(() => !!(this.status() || this.athleteId() || this.from() || this.to()));

  protected clear(): void {
    this.status.set('');
    this.athleteId.set(null);
    this.from.set(null);
    this.to.set(null);
  }
}
