import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { ConfigStore } from '../../core/config-store';

/**
 * Demo mode only: says where the demo's e-mail (invitations, reset links) can be read — the demo
 * inbox on the machine running Trailframe, outside the app. Renders nothing otherwise.
 */
@Component({
  selector: 'app-demo-inbox-note',
  imports: [MatIconModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    @if (config.demoInboxUrl(); as url) {
      <aside class="note" aria-label="Demo inbox">
        <mat-icon aria-hidden="true">science</mat-icon>
        <span>
          Demo mode: e-mails go to the demo inbox at
          <a [href]="url" target="_blank" rel="noopener noreferrer">{{ url }}</a>
          — it opens only on the machine running Trailframe.
        </span>
      </aside>
    }
  `,
  styles: `
    .note {
      display: flex;
      gap: 8px;
      align-items: flex-start;
      padding: 12px;
      border-radius: 8px;
      background: var(--mat-sys-surface-container);
      color: var(--mat-sys-on-surface-variant);
      font: var(--mat-sys-body-medium);
      overflow-wrap: anywhere;
    }
    mat-icon {
      flex: none;
    }
  `,
})
export class DemoInboxNote {
  protected readonly config = inject(ConfigStore);
}
