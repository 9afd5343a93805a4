import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDialogModule } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';

/**
 * The foot of a dialog that does one thing: a button that closes it, then the button that does
 * it, with the words the dialog projects and, given `icon`, an icon before them (drawn here, so
 * the button lays it out as its own icon). The element has no box of its own, so the
 * actions row stays a direct part of the dialog's layout (Angular Material, "Dialog": content
 * and actions sections).
 */
@Component({
  selector: 'tb-dialog-actions',
  imports: [MatButtonModule, MatDialogModule, MatIconModule],
  templateUrl: './dialog-actions.html',
  styles: `
    :host {
      display: contents;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class DialogActions {
  /** The closing button's words. */
  readonly cancel = input('Cancel');
  /** Whether the dialog offers its action at all (a read-only view only closes). */
  readonly offered = input(true);
  /** The action's icon, e.g. 'handshake'; none when empty. */
  readonly icon = input('');
  readonly disabled = input(false);
  /** The action button's data-testid, for browser tests. */
  readonly testId = input<string | null>(null);
  /** The action button was pressed. */
  readonly confirmed = output();
}
