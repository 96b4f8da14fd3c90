import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { ReactiveFormsModule } from '@angular/forms';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { PLAN_LIMITS } from '../../../../contracts/plans';
import { errorText } from '../../../shared/forms/error-text';
import type { DoseGroup } from '../plan-form-model';

/** Short messages: the number fields are narrow. */
const short = (limits: { min: number; max: number }) => ({
  required: 'Required',
  whole: 'Whole number',
  min: `Min ${limits.min}`,
  max: `Max ${limits.max}`,
});

/** The fields of a dose: sets, reps, hold, tempo, load, rest and days a week. */
@Component({
  selector: 'app-dose-fields',
  imports: [ReactiveFormsModule, MatFormFieldModule, MatInputModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <div class="dose-grid nums" [formGroup]="group()">
      <mat-form-field class="num">
        <mat-label>Sets</mat-label>
        <input matInput type="number" inputmode="numeric" formControlName="sets" [min]="L.sets.min" [max]="L.sets.max" required />
        <mat-error>{{ errorText(group().controls.sets, 'Sets', short(L.sets)) }}</mat-error>
      </mat-form-field>
      <mat-form-field class="num">
        <mat-label>Reps</mat-label>
        <input matInput type="number" inputmode="numeric" formControlName="reps" [min]="L.reps.min" [max]="L.reps.max" />
        <mat-error>{{ errorText(group().controls.reps, 'Reps', short(L.reps)) }}</mat-error>
      </mat-form-field>
      <mat-form-field class="num">
        <mat-label>Hold</mat-label>
        <input
          matInput
          type="number"
          inputmode="numeric"
          formControlName="holdSeconds"
          [min]="L.holdSeconds.min"
          [max]="L.holdSeconds.max"
        />
        <span matTextSuffix>s</span>
        <mat-error>{{ errorText(group().controls.holdSeconds, 'Hold', short(L.holdSeconds)) }}</mat-error>
      </mat-form-field>
      <mat-form-field class="num">
        <mat-label>Rest</mat-label>
        <input
          matInput
          type="number"
          inputmode="numeric"
          formControlName="restSeconds"
          [min]="L.restSeconds.min"
          [max]="L.restSeconds.max"
        />
        <span matTextSuffix>s</span>
        <mat-error>{{ errorText(group().controls.restSeconds, 'Rest', short(L.restSeconds)) }}</mat-error>
      </mat-form-field>
      <mat-form-field class="num">
        <mat-label>Days a week</mat-label>
        <input
          matInput
          type="number"
          inputmode="numeric"
          formControlName="daysPerWeek"
          [min]="L.daysPerWeek.min"
          [max]="L.daysPerWeek.max"
          required
        />
        <mat-error>{{ errorText(group().controls.daysPerWeek, 'Days a week', short(L.daysPerWeek)) }}</mat-error>
      </mat-form-field>
    </div>
    <div class="dose-grid texts" [formGroup]="group()">
      <mat-form-field>
        <mat-label>Tempo (optional)</mat-label>
        <input matInput formControlName="tempo" placeholder="e.g. 3 s down, 1 s up" />
        <mat-error>{{ errorText(group().controls.tempo, 'Tempo') }}</mat-error>
      </mat-form-field>
      <mat-form-field>
        <mat-label>Load (optional)</mat-label>
        <input matInput formControlName="load" placeholder="e.g. body weight" />
        <mat-error>{{ errorText(group().controls.load, 'Load') }}</mat-error>
      </mat-form-field>
    </div>
    @if (group().hasError('repsOrHold') && (group().touched || group().dirty)) {
      <p class="dose-problem" role="alert">Give reps, a hold time, or both.</p>
    }
  `,
  styles: `
    .dose-grid {
      display: grid;
      gap: 0 10px;
    }
    .nums {
      grid-template-columns: repeat(auto-fit, minmax(96px, 1fr));
    }
    .texts {
      grid-template-columns: repeat(auto-fit, minmax(220px, 1fr));
    }
    .dose-problem {
      margin: -8px 0 8px;
      color: var(--mat-sys-error);
      font: var(--mat-sys-body-small);
    }
  `,
})
export class DoseFields {
  readonly group = input.required<DoseGroup>();
  protected readonly L = PLAN_LIMITS;
  protected readonly errorText = errorText;
  protected readonly short = short;
}
