import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal, untracked } from '@angular/core';
import { rxResource, takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
import { FormArray, FormControl, FormGroup, NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatDatepickerModule } from '@angular/material/datepicker';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { ActivatedRoute, Router, RouterLink } from '@angular/router';
import { firstValueFrom, of, startWith, throwError } from 'rxjs';
import type { Assessment } from '../../../../contracts/api';
import { ASSESSMENT_KIND_LABELS } from '../../../../contracts/assessment';
import type { InvoiceDetail, InvoiceLineWrite, InvoiceWrite, Price } from '../../../../contracts/billing';
import { errorMessage, errorStatus, fieldProblems } from '../../../core/api-error';
import { LeaveGuarded, LeaveWarning, UNSAVED_CHANGES_WARNING, warnBeforeUnload } from '../../../core/leave-guard';
import { parseIsoDate, toIsoDate } from '../../../shared/dates';
import { errorText } from '../../../shared/forms/error-text';
import { applyServerErrors } from '../../../shared/forms/server-errors';
import { requiredTrimmed, wholeNumber } from '../../../shared/forms/validators';
import { DecimalInput } from '../../../shared/forms/decimal-input';
import { ErrorState } from '../../../shared/states/error-state';
import { AssessmentsApi } from '../../../core/data/assessments-api';
import { AthletesApi } from '../../../core/data/athletes-api';
import { BillingApi } from '../../../core/data/billing-api';
import { money } from '../../../shared/billing-words';
import { newLogKey } from '../../../shared/plan-words';
import { amountValidator, taxValidator } from '../price-list/price-list';
import {
  formFromInvoice,
  lineFromPrice,
  presetFromQuery,
  previewTotals,
  priceForAssessment,
  toLineWrite,
  type LineDraft,
} from './invoice-lines';

type LineGroup = FormGroup<{
  priceId: FormControl<number | null>;
  description: FormControl<string>;
  quantity: FormControl<number | null>;
  amount: FormControl<string>;
  tax: FormControl<string>;
}>;

/** Today's local date plus two weeks (the usual due date). */
const inTwoWeeks = () => {
  const d = new Date();
  return new Date(d.getFullYear(), d.getMonth(), d.getDate() + 14);
};

/**
 * `/billing/invoices/new` (owner): a draft invoice for an athlete, from one of their assessments or
 * by hand; lines from the price list or custom; totals previewed as the server will compute them.
 * `?athlete=:id` preselects the athlete, `&assessment=:id` also that visit (and its usual price).
 * `/billing/invoices/:id/edit`: the same form, filled from a saved draft; saving replaces it.
 */
@Component({
  selector: 'app-invoice-form',
  imports: [
    DecimalInput,
    DatePipe,
    ReactiveFormsModule,
    RouterLink,
    MatCardModule,
    MatDatepickerModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatButtonModule,
    MatIconModule,
    MatProgressBarModule,
    ErrorState,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { '(window:beforeunload)': 'onBeforeUnload($event)' },
  templateUrl: './invoice-form.html',
  styleUrl: './invoice-form.scss',
})
export class InvoiceForm implements LeaveGuarded {
  private readonly api = inject(BillingApi);
  /** Sent with the new invoice: saving again after the answer was lost (a dropped connection) makes no second invoice. */
  private readonly createKey = newLogKey();
  private readonly assessmentsApi = inject(AssessmentsApi);
  private readonly athletesApi = inject(AthletesApi);
  private readonly router = inject(Router);
  private readonly fb = inject(NonNullableFormBuilder);

  /** Route parameter of `/billing/invoices/:id/edit`; absent for a new invoice. */
  readonly id = input<string>();
  /** Whether this form edits a saved draft (rather than making a new one). */
  protected readonly isEdit = computed(() => this.id() !== undefined);
  /** The draft being edited. */
  protected readonly existing = rxResource({
    params: () => (this.isEdit() ? Number(this.id()) : undefined),
    stream: ({ params }) =>
      Number.isInteger(params) && params > 0 ? this.api.invoice(params) : throwError(() => new Error('Not a valid invoice address.')),
  });
  /** The saved invoice when it is no longer a draft (it cannot be edited then). */
  protected readonly locked = computed<InvoiceDetail | null>(() => {
    const inv = this.existing.hasValue() ? this.existing.value() : null;
    return inv && inv.status !== 'draft' ? inv : null;
  });
  /** Whether the form has its values (always for a new invoice; once the draft loaded when editing). */
  protected readonly filled = signal(false);
  /** Where Cancel and the breadcrumb lead back to. */
  protected readonly backLink = computed(() => (this.isEdit() ? ['/billing/invoices', this.id()] : ['/billing/invoices']));

  protected readonly athletes = rxResource({ stream: () => this.athletesApi.list() });
  protected readonly prices = rxResource({ stream: () => this.api.prices() });
  protected readonly settings = rxResource({ stream: () => this.api.settings() });

  protected readonly form = new FormGroup({
    athleteId: new FormControl<number | null>(null, Validators.required),
    assessmentId: new FormControl<number | null>(null),
    dueDate: new FormControl<Date | null>(inTwoWeeks(), Validators.required),
    note: new FormControl('', { nonNullable: true, validators: [Validators.maxLength(500)] }),
    lines: new FormArray<LineGroup>([]),
  });
  protected readonly lines = this.form.controls.lines;

  private readonly athleteId = toSignal(this.form.controls.athleteId.valueChanges.pipe(startWith(null)), { initialValue: null });
  protected readonly assessments = rxResource({
    params: () => this.athleteId(),
    stream: ({ params }) => (params ? this.assessmentsApi.list(params) : of([] as Assessment[])),
  });
  private readonly formValue = toSignal(this.form.valueChanges, { initialValue: this.form.getRawValue() });
  protected readonly totals = computed(() => {
    this.formValue();
    return previewTotals(this.lines.getRawValue() as LineDraft[]);
  });
  // A resource in error throws from value(): the lists below are read only when they have one.
  protected readonly currency = computed(() => (this.settings.hasValue() ? this.settings.value().currency : ''));
  protected readonly athleteOptions = computed(() => (this.athletes.hasValue() ? this.athletes.value() : []));
  protected readonly assessmentOptions = computed(() => (this.assessments.hasValue() ? this.assessments.value() : []));
  protected readonly priceOptions = computed(() => (this.prices.hasValue() ? this.prices.value() : []));
  /** What the form could not load (the athletes, the prices, the currency, the athlete's visits), said once with one Try again. */
  protected readonly listProblem = computed(() => {
    const failed = this.lists().filter((l) => l.resource.error());
    if (!failed.length) return null;
    const names = failed.map((l) => l.what);
    const joined = names.length === 1 ? names[0] : `${names.slice(0, -1).join(', ')} and ${names[names.length - 1]}`;
    return { title: `Couldn't load ${joined}`, message: errorMessage(failed[0]!.resource.error()) };
  });
  protected readonly saving = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly kindLabels = ASSESSMENT_KIND_LABELS;
  protected readonly errorText = errorText;
  protected readonly errorMessage = errorMessage;
  protected readonly money = money;
  /** An assessment from `?assessment=` waiting for the athlete's assessments and the prices to load. */
  private readonly presetAssessment = signal<number | null>(null);

  constructor() {
    this.addLine();
    const query = inject(ActivatedRoute).snapshot.queryParamMap;
    const preset = presetFromQuery(query.get('athlete'), query.get('assessment'));
    if (preset.athleteId) this.form.controls.athleteId.setValue(preset.athleteId);
    this.presetAssessment.set(preset.assessmentId);
    this.form.controls.athleteId.valueChanges.pipe(takeUntilDestroyed()).subscribe(() => this.form.controls.assessmentId.setValue(null));

    // A new invoice is ready at once; an edited one once its draft has loaded.
    effect(() => {
      if (!this.isEdit()) {
        this.filled.set(true);
        return;
      }
      const inv = this.existing.hasValue() ? this.existing.value() : null;
      if (!inv || inv.status !== 'draft' || untracked(this.filled)) return;
      untracked(() => this.fill(inv));
    });

    // "Invoice this visit": choose the assessment and its usual price once both lists are there.
    effect(() => {
      const wanted = this.presetAssessment();
      if (wanted === null || this.assessments.isLoading() || !this.assessments.hasValue() || !this.prices.hasValue()) return;
      const list = this.assessments.value();
      untracked(() => {
        this.presetAssessment.set(null);
        const a = list.find((x) => x.id === wanted);
        if (!a) return;
        this.form.controls.assessmentId.setValue(a.id);
        this.pickAssessment(a);
      });
    });
  }

  private lists() {
    return [
      { what: 'the athletes', resource: this.athletes },
      { what: 'the price list', resource: this.prices },
      { what: "the clinic's currency", resource: this.settings },
      { what: "the athlete's assessments", resource: this.assessments },
    ];
  }

  /** Try again: loads the lists that failed once more. */
  protected reloadFailedLists(): void {
    for (const l of this.lists()) if (l.resource.error()) l.resource.reload();
  }

  /** Puts a saved draft into the form (athlete first: choosing an athlete clears the assessment). */
  private fill(inv: InvoiceDetail): void {
    const f = formFromInvoice(inv);
    this.form.controls.athleteId.setValue(f.athleteId);
    this.form.controls.assessmentId.setValue(f.assessmentId);
    this.form.controls.dueDate.setValue(parseIsoDate(f.dueDate));
    this.form.controls.note.setValue(f.note);
    this.lines.clear();
    for (const l of f.lines) this.addLine(l);
    this.form.markAsPristine();
    this.filled.set(true);
  }

  protected addLine(draft?: LineDraft): void {
    const d = draft ?? { priceId: null, description: '', quantity: 1, amount: '', tax: '' };
    this.lines.push(
      this.fb.group({
        priceId: new FormControl<number | null>(d.priceId),
        description: this.fb.control(d.description, [requiredTrimmed, Validators.maxLength(120)]),
        quantity: new FormControl<number | null>(d.quantity, [Validators.required, wholeNumber, Validators.min(1), Validators.max(1000)]),
        amount: this.fb.control(d.amount, [Validators.required, amountValidator]),
        tax: this.fb.control(d.tax, [taxValidator]),
      }) as LineGroup,
    );
  }

  protected removeLine(i: number): void {
    this.lines.removeAt(i);
  }

  /** Picking a price fills the line; "Custom" leaves it for typing. */
  protected pickPrice(i: number, priceId: number | null): void {
    const p = this.priceOptions().find((x) => x.id === priceId);
    if (p) this.lines.at(i).setValue(lineFromPrice(p));
  }

  /** Billing an assessment suggests its usual price when the lines are still empty. */
  protected pickAssessment(a: Assessment | null): void {
    if (!a) return;
    const p = priceForAssessment(a.kind, this.priceOptions());
    const first = this.lines.at(0);
    const untouched = this.lines.length === 1 && first && !first.controls.description.value.trim() && !first.controls.amount.value.trim();
    if (p && (untouched || this.lines.length === 0)) {
      if (this.lines.length) first.setValue(lineFromPrice(p));
      else this.addLine(lineFromPrice(p));
    }
  }

  protected priceLabel(p: Price): string {
    return `${p.item} · ${money(p.amountMinor, p.currency)}`;
  }

  /** Lines, dates or a note changed and not saved yet: asked before leaving. */
  leaveWarning(): LeaveWarning | null {
    return this.form.dirty ? UNSAVED_CHANGES_WARNING : null;
  }

  protected onBeforeUnload(event: BeforeUnloadEvent): void {
    warnBeforeUnload(event, this.leaveWarning());
  }

  protected async save(): Promise<void> {
    if (this.saving()) return;
    if (this.form.invalid || this.lines.length === 0) {
      this.form.markAllAsTouched();
      this.problem.set(this.lines.length === 0 ? 'Add at least one line.' : null);
      return;
    }
    const v = this.form.getRawValue();
    const body: InvoiceWrite = {
      athleteId: v.athleteId!,
      assessmentId: v.assessmentId,
      dueDate: toIsoDate(v.dueDate) ?? '',
      note: v.note.trim() || null,
      lines: (v.lines as LineDraft[]).map((l) => toLineWrite(l) as InvoiceLineWrite),
    };
    const editing = this.isEdit() ? (this.existing.hasValue() ? this.existing.value() : null) : undefined;
    // Editing, the draft must be there to replace (the form shows only then; this guards a reload that failed meanwhile).
    if (editing === null) return;
    this.saving.set(true);
    this.problem.set(null);
    try {
      const saved = await firstValueFrom(editing ? this.api.updateInvoice(editing.id, body) : this.api.createInvoice(body, this.createKey));
      // Saved: leaving for the invoice loses nothing.
      this.form.markAsPristine();
      await this.router.navigate(['/billing/invoices', saved.id]);
    } catch (err) {
      if (errorStatus(err) === 422) {
        const problems = fieldProblems(err).map((p) => ({
          ...p,
          path: p.path.map((seg) =>
            seg === 'unitAmountMinor' ? 'amount' : seg === 'taxRateBp' ? 'tax' : seg === 'priceId' ? 'description' : seg,
          ),
        }));
        const rest = applyServerErrors(this.form, problems);
        this.problem.set(rest.length ? rest.join(' ') : null);
      } else {
        this.problem.set(errorMessage(err));
      }
    } finally {
      this.saving.set(false);
    }
  }
}
