import { BreakpointObserver } from '@angular/cdk/layout';
import { ChangeDetectionStrategy, Component, computed, inject, linkedSignal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatDividerModule } from '@angular/material/divider';
import { MatIconModule } from '@angular/material/icon';
import { MatListModule } from '@angular/material/list';
import { MatMenuModule } from '@angular/material/menu';
import { MatSidenavModule } from '@angular/material/sidenav';
import { MatToolbarModule } from '@angular/material/toolbar';
import { Router, RouterLink, RouterLinkActive, RouterOutlet } from '@angular/router';
import { map } from 'rxjs';
import { BrandMark } from '../../shared/brand-mark/brand-mark';
import { ClinicBrandStore } from '../data/clinic-brand-store';
import { SIGNING_OUT } from '../auth-guards';
import { AuthStore } from '../auth-store';
import { ROLE_LABELS } from '../roles';
import { navItemsFor } from './nav-items';

/** Below this width the side navigation becomes an overlay opened from the menu button. */
const NARROW = '(max-width: 959.98px)';

/** The signed-in frame: top bar, role-aware side navigation and the routed page. */
@Component({
  selector: 'app-shell',
  imports: [
    RouterOutlet,
    RouterLink,
    RouterLinkActive,
    MatToolbarModule,
    MatSidenavModule,
    MatListModule,
    MatIconModule,
    MatButtonModule,
    MatMenuModule,
    MatDividerModule,
    BrandMark,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './shell.html',
  styleUrl: './shell.scss',
})
export class Shell {
  protected readonly auth = inject(AuthStore);
  /** The clinic's logo beside its name (the portal's header for athletes). */
  protected readonly brand = inject(ClinicBrandStore);
  private readonly router = inject(Router);

  protected readonly isNarrow = toSignal(
    inject(BreakpointObserver)
      .observe(NARROW)
      .pipe(map((state) => state.matches)),
    { initialValue: false },
  );
  /** Open by default on wide screens, closed on narrow ones; the user can toggle either way. */
  protected readonly navOpen = linkedSignal(() => !this.isNarrow());
  protected readonly navItems = computed(() => navItemsFor(this.auth.role()));
  protected readonly roleLabel = computed(() => {
    const role = this.auth.role();
    return role ? ROLE_LABELS[role] : '';
  });

  protected toggleNav(): void {
    this.navOpen.update((open) => !open);
  }

  protected onNavigate(): void {
    if (this.isNarrow()) this.navOpen.set(false);
  }

  protected async signOut(): Promise<void> {
    // Leave first, so a page with unsaved edits can ask (and the user can stay, still signed in).
    if (!(await this.router.navigateByUrl('/sign-in', { state: { [SIGNING_OUT]: true } }))) return;
    await this.auth.signOut();
  }
}
