import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatTooltipModule } from '@angular/material/tooltip';

/**
 * A button that shows only an icon: its accessible name in `label` (WAI-ARIA Authoring
 * Practices, "Button pattern": a button without visible text is named by `aria-label`) and, given
 * `tip`, a tooltip for pointer users. The page listens to `(click)` on the element: the inner
 * button's click bubbles to it, and a disabled button fires none (HTML, "Disabled elements").
 */
@Component({
  selector: 'tb-icon-button',
  imports: [MatButtonModule, MatIconModule, MatTooltipModule],
  templateUrl: './icon-button.html',
  styles: `
    :host {
      display: inline-block;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class IconButton {
  /** The icon's name in the app's icon set, e.g. 'delete'. */
  readonly icon = input.required<string>();
  /** What the button does, read by screen readers: "Remove rung 2". */
  readonly label = input.required<string>();
  /** A short tooltip, e.g. "Move up"; none when empty (a tooltip without a message never shows). */
  readonly tip = input('');
  readonly disabled = input(false);
}
