import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { firstValueFrom } from 'rxjs';
import type { PainRule, PlanDetail } from '../../../../contracts/plans';
import { DEFAULT_PAIN_RULE, DEFAULT_PAIN_RULE_SOURCE } from '../../../../contracts/plans';
import { errorMessage, errorStatus, fieldProblems } from '../../../core/api-error';
import { errorText } from '../../../shared/forms/error-text';
import { applyServerErrors } from '../../../shared/forms/server-errors';
import { wholeNumber } from '../plan-form-model';
import { PlansApi } from '../../../core/data/plans-api';

/** Edits a plan's pain-monitoring rule. Closes with the plan as saved. */
@Component({
  selector: 'app-pain-rule-dialog',
  imports: [ReactiveFormsModule, MatDialogModule, MatFormFieldModule, MatInputModule, MatCheckboxModule, MatButtonModule, MatIconModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <h2 mat-dialog-title>Pain rule of this plan</h2>
    <form [formGroup]="form" (ngSubmit)="save()" novalidate>
      <mat-dialog-content>
        <p class="note">Default: {{ source }}</p>
        @if (problem(); as message) {
          <p class="form-problem" role="alert">
            <mat-icon>error_outline</mat-icon><span>{{ message }}</span>
          </p>
        }
        <div class="form-grid">
          <mat-form-field>
            <mat-label>Highest pain during exercise</mat-label>
            <input matInput type="number" inputmode="numeric" formControlName="maxDuring" min="0" max="10" />
            <span matTextSuffix>/10</span>
            <mat-error>{{
              errorText(form.controls.maxDuring, 'Pain', { min: 'Use 0 to 10', max: 'Use 0 to 10', whole: 'Use a whole number' })
            }}</mat-error>
          </mat-form-field>
          <mat-form-field>
            <mat-label>Settled next morning means at most</mat-label>
            <input matInput type="number" inputmode="numeric" formControlName="settledMorningMax" min="0" max="10" />
            <span matTextSuffix>/10</span>
            <mat-error>{{
              errorText(form.controls.settledMorningMax, 'Pain', { min: 'Use 0 to 10', max: 'Use 0 to 10', whole: 'Use a whole number' })
            }}</mat-error>
          </mat-form-field>
        </div>
        <p><mat-checkbox formControlName="morningMustSettle">Alert when pain has not settled by the next morning</mat-checkbox></p>
        <p><mat-checkbox formControlName="noWeeklyRise">Alert when weekly pain rises from one week to the next</mat-checkbox></p>
      </mat-dialog-content>
      <mat-dialog-actions align="end">
        <button mat-button type="button" (click)="reset()">Use the default</button>
        <span class="spacer"></span>
        <button mat-button type="button" mat-dialog-close>Cancel</button>
        <button mat-flat-button type="submit" [disabled]="busy()">Save rule</button>
      </mat-dialog-actions>
    </form>
  `,
  styles: `
    .spacer {
      flex: 1;
    }
  `,
})
export class PainRuleDialog {
  private readonly api = inject(PlansApi);
  private readonly ref = inject<MatDialogRef<PainRuleDialog, PlanDetail>>(MatDialogRef);
  private readonly plan = inject<PlanDetail>(MAT_DIALOG_DATA);
  private readonly fb = inject(NonNullableFormBuilder);
  private readonly pain = [Validators.required, Validators.min(0), Validators.max(10), wholeNumber];
  protected readonly form = this.fb.group({
    maxDuring: this.fb.control<number | null>(this.plan.painRule.maxDuring, this.pain),
    settledMorningMax: this.fb.control<number | null>(this.plan.painRule.settledMorningMax, this.pain),
    morningMustSettle: this.fb.control(this.plan.painRule.morningMustSettle),
    noWeeklyRise: this.fb.control(this.plan.painRule.noWeeklyRise),
  });
  protected readonly source = DEFAULT_PAIN_RULE_SOURCE;
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly errorText = errorText;

  protected reset(): void {
    this.form.setValue({ ...DEFAULT_PAIN_RULE });
    this.form.markAsDirty();
  }

  protected async save(): Promise<void> {
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    const v = this.form.getRawValue();
    const rule: PainRule = {
      maxDuring: v.maxDuring ?? 0,
      settledMorningMax: v.settledMorningMax ?? 0,
      morningMustSettle: v.morningMustSettle,
      noWeeklyRise: v.noWeeklyRise,
    };
    this.busy.set(true);
    try {
      this.ref.close(await firstValueFrom(this.api.putPainRule(this.plan.id, rule)));
    } catch (err) {
      if (errorStatus(err) === 422) {
        const rest = applyServerErrors(this.form, fieldProblems(err));
        this.problem.set(rest.length ? rest.join(' ') : 'Check the highlighted fields.');
      } else {
        this.problem.set(errorMessage(err));
      }
    } finally {
      this.busy.set(false);
    }
  }
}
