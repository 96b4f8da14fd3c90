import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { RouterLink } from '@angular/router';
import { PublicCard } from '../../shared/public-card/public-card';
import { AuthStore } from '../auth-store';

/** Unknown addresses. */
@Component({
  selector: 'app-not-found',
  imports: [PublicCard, MatButtonModule, RouterLink],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <app-public-card heading="Page not found">
      <p>There is no page at this address. The link may be mistyped or out of date.</p>
      <a mat-flat-button [routerLink]="auth.homePath()">
        {{ auth.isSignedIn() ? 'Go to your home page' : 'Go to sign in' }}
      </a>
    </app-public-card>
  `,
})
export class NotFound {
  protected readonly auth = inject(AuthStore);
}
