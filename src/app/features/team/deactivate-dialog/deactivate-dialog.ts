import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { FormControl, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatSelectModule } from '@angular/material/select';
import type { StaffMember } from '../../../../contracts/api';
import { heirChoices } from '../team-logic';

/** Who is leaving, who could take their athletes, and who is asking. */
export interface DeactivateDialogData {
  member: StaffMember;
  staff: StaffMember[];
  /** The signed-in owner's id (offered as "You"). */
  selfId: number;
}

/**
 * Asks the owner to confirm a coach's deactivation and to choose who takes over their athletes.
 * Closes with the chosen staff id, or undefined when cancelled.
 */
@Component({
  selector: 'app-deactivate-dialog',
  imports: [ReactiveFormsModule, MatDialogModule, MatButtonModule, MatFormFieldModule, MatSelectModule, MatIconModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <h2 mat-dialog-title>Deactivate {{ data.member.name }}?</h2>
    <mat-dialog-content>
      <p>
        They are signed out at once and can no longer sign in. Their assessments, marks, plans and shared items stay in the clinic's
        records.
      </p>
      @if (data.member.athleteCount > 0) {
        <p>
          Their {{ data.member.athleteCount === 1 ? 'athlete moves' : data.member.athleteCount + ' athletes move' }}
          to the coach you choose:
        </p>
        <mat-form-field class="full">
          <mat-label>Athletes go to</mat-label>
          <mat-select [formControl]="heir" required>
            @for (c of choices; track c.id) {
              <mat-option [value]="c.id">{{ c.label }}</mat-option>
            }
          </mat-select>
        </mat-form-field>
      } @else {
        <p>They coach no athletes at the moment.</p>
      }
      <p class="muted">You can reactivate them later; athletes who moved stay with their new coach.</p>
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button mat-button type="button" [mat-dialog-close]="undefined">Cancel</button>
      <button mat-flat-button type="button" class="danger" (click)="confirm()" [disabled]="heir.invalid" cdkFocusInitial>Deactivate</button>
    </mat-dialog-actions>
  `,
  styles: `
    .full {
      inline-size: 100%;
    }
    .muted {
      color: var(--mat-sys-on-surface-variant);
    }
    .danger {
      --mat-button-filled-container-color: var(--mat-sys-error);
      --mat-button-filled-label-text-color: var(--mat-sys-on-error);
    }
  `,
})
export class DeactivateDialog {
  protected readonly data = inject<DeactivateDialogData>(MAT_DIALOG_DATA);
  private readonly ref = inject<MatDialogRef<DeactivateDialog, number>>(MatDialogRef);
  protected readonly choices = heirChoices(this.data.staff, this.data.member.id, this.data.selfId);
  protected readonly heir = new FormControl<number>(this.data.selfId, { nonNullable: true, validators: Validators.required });

  protected confirm(): void {
    if (this.heir.invalid) return;
    this.ref.close(this.heir.value);
  }
}
