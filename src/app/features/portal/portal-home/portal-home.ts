import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import { AuthStore } from '../../../core/auth-store';
import { AssessmentList } from '../../../shared/assessment-list/assessment-list';
import { InvoicesDue } from '../invoices-due/invoices-due';
import { PortalPlanCard } from '../portal-plan-card/portal-plan-card';
import { PortalShared } from '../../../shared/sharing/portal-shared/portal-shared';

/** `/portal`: the athlete's home page. */
@Component({
  selector: 'app-portal-home',
  imports: [RouterLink, MatCardModule, MatButtonModule, MatIconModule, AssessmentList, InvoicesDue, PortalPlanCard, PortalShared],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './portal-home.html',
  styleUrl: './portal-home.scss',
})
export class PortalHome {
  private readonly auth = inject(AuthStore);
  protected readonly user = this.auth.user;
  protected readonly athleteId = computed(() => this.user()?.athleteId ?? null);
  protected readonly firstName = computed(() => this.user()?.name.split(/\s+/)[0] ?? '');
}
