import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { Clipboard } from '@angular/cdk/clipboard';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import type { CreatedToken } from '@shared/api/person';
import { WhenPipe } from '../../core/format/formats';

/** Shows a new API token the one time it can be seen, with a copy button. */
@Component({
  selector: 'tb-token-reveal',
  imports: [MatButtonModule, MatDialogModule, MatIconModule, WhenPipe],
  template: `
    <h2 mat-dialog-title>Your new API token</h2>
    <mat-dialog-content>
      <p class="warning" role="alert">
        <mat-icon svgIcon="warning" aria-hidden="true" />
        <span
          >Copy it now: this is the only time it is shown. Tuttiboard keeps only a fingerprint of
          it, so nobody can show it to you again.</span
        >
      </p>
      @if (created.label) {
        <p class="label">
          Label: <strong>{{ created.label }}</strong>
        </p>
      }
      <p class="label">
        Works until <strong>{{ created.expiresAt | when }}</strong>; make a new one before then.
      </p>
      <div class="token-row">
        <code data-testid="new-token" aria-label="API token">{{ created.token }}</code>
        <button mat-stroked-button type="button" (click)="copy()" data-testid="copy-token">
          <mat-icon [svgIcon]="copied() ? 'check' : 'content_copy'" />{{
            copied() ? 'Copied' : 'Copy'
          }}
        </button>
      </div>
      <p class="tb-muted usage">
        A script sends it in the header <code>Authorization: Bearer &lt;token&gt;</code> and acts as
        you, with your role. Keep it out of shared folders and e-mail; revoke it here when the
        script is retired or the token may have leaked.
      </p>
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button mat-flat-button type="button" mat-dialog-close data-testid="token-done">
        I have copied it
      </button>
    </mat-dialog-actions>
  `,
  styles: `
    .warning {
      display: flex;
      gap: 8px;
      align-items: flex-start;
      margin: 0 0 12px;
      padding: 10px 12px;
      border-radius: 8px;
      background: var(--tb-brass-soft);
      color: #4a2f00;
      line-height: 1.45;
      mat-icon {
        flex: none;
        fill: #5a3a00;
      }
    }
    .label {
      margin: 0 0 8px;
    }
    .token-row {
      display: flex;
      gap: 8px;
      align-items: center;
    }
    .token-row code {
      flex: 1;
      padding: 10px 12px;
      border: 1px solid var(--tb-line);
      border-radius: 8px;
      background: #fff;
      font-size: 0.85rem;
      word-break: break-all;
      user-select: all;
    }
    .usage {
      margin: 12px 0 0;
      line-height: 1.5;
      max-width: 34rem;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TokenReveal {
  private readonly clipboard = inject(Clipboard);
  protected readonly created = inject<CreatedToken>(MAT_DIALOG_DATA);
  protected readonly copied = signal(false);

  protected copy(): void {
    this.copied.set(this.clipboard.copy(this.created.token));
  }
}
