import { ChangeDetectionStrategy, Component } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDialogModule } from '@angular/material/dialog';
import { KEY_HELP } from '../key-map';

/** The review workspace's keyboard map (opened with `?`). */
@Component({
  selector: 'app-key-help-dialog',
  imports: [MatDialogModule, MatButtonModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <h2 mat-dialog-title>Keyboard</h2>
    <!-- Focusable so keyboard users can scroll the list when it is taller than the dialog. -->
    <mat-dialog-content tabindex="0" role="region" aria-label="Keys of the review workspace">
      <p class="intro">
        Keys work while the focus is not in a text field; the frame keys (← →, Home, End, [ ], Space, comma and full stop) step frames even
        after you click a tab, toggle or button. The mouse wheel scrolls the page: to zoom the frame, hold Ctrl (⌘ on a Mac) while
        scrolling, pinch, or use + and −. On a Mac, use ⌘ for Ctrl.
      </p>
      <div class="groups">
        @for (group of groups; track group.title) {
          <section>
            <h3>{{ group.title }}</h3>
            <table>
              <tbody>
                @for (row of group.rows; track row.does) {
                  <tr>
                    <th scope="row">
                      @for (k of row.keys; track k; let last = $last) {
                        <kbd>{{ k }}</kbd>
                        @if (!last) {
                          <span class="sep">/</span>
                        }
                      }
                    </th>
                    <td>{{ row.does }}</td>
                  </tr>
                }
              </tbody>
            </table>
          </section>
        }
      </div>
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button mat-flat-button type="button" mat-dialog-close cdkFocusInitial>Close</button>
    </mat-dialog-actions>
  `,
  styles: `
    .intro {
      margin-top: 0;
      color: var(--mat-sys-on-surface-variant);
    }
    .groups {
      display: grid;
      grid-template-columns: repeat(auto-fit, minmax(280px, 1fr));
      gap: 8px 24px;
    }
    h3 {
      font: var(--mat-sys-title-small);
      margin: 8px 0 4px;
    }
    table {
      border-collapse: collapse;
      inline-size: 100%;
    }
    th {
      text-align: start;
      font-weight: 400;
      inline-size: 42%;
      padding: 3px 12px 3px 0;
      vertical-align: top;
    }
    td {
      padding: 3px 0;
      font: var(--mat-sys-body-medium);
    }
    kbd {
      display: inline-block;
      min-inline-size: 1.4em;
      padding: 0 5px;
      border: 1px solid var(--mat-sys-outline-variant);
      border-block-end-width: 2px;
      border-radius: 4px;
      background: var(--mat-sys-surface-container-lowest);
      font: var(--mat-sys-label-medium);
      text-align: center;
      white-space: nowrap;
    }
    .sep {
      margin-inline: 3px;
      color: var(--mat-sys-on-surface-variant);
    }
  `,
})
export class KeyHelpDialog {
  protected readonly groups = KEY_HELP;
}
