import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule } from '@angular/material/dialog';

/** What the fleet's confirm dialog asks. */
export interface FleetConfirmData {
  title: string;
  paragraphs: string[];
  confirm: string;
  /** Whether the step marks or sends something that cannot be taken back. */
  weighty?: boolean;
}

/** Asks before a fleet step with consequences; closes with true when the user goes ahead. */
@Component({
  selector: 'tb-fleet-confirm-dialog',
  imports: [MatButtonModule, MatDialogModule],
  template: `
    <h2 mat-dialog-title>{{ data.title }}</h2>
    <mat-dialog-content>
      @for (paragraph of data.paragraphs; track $index) {
        <p>{{ paragraph }}</p>
      }
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button mat-button type="button" [mat-dialog-close]="false">Cancel</button>
      <button
        mat-flat-button
        type="button"
        [class.weighty]="data.weighty"
        [mat-dialog-close]="true"
        data-testid="confirm"
      >
        {{ data.confirm }}
      </button>
    </mat-dialog-actions>
  `,
  styles: `
    p {
      line-height: 1.5;
      max-width: 34rem;
    }
    .weighty {
      --mat-button-filled-container-color: var(--tb-danger);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class FleetConfirmDialog {
  protected readonly data = inject<FleetConfirmData>(MAT_DIALOG_DATA);
}
