import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule, type MatDialog } from '@angular/material/dialog';
import { dialogAnswer } from './dialog-answer';

/** What the confirm dialog asks. */
export interface ConfirmDialogData {
  title: string;
  paragraphs: string[];
  confirm: string;
  /**
   * Whether the step cannot be taken back (it deletes, marks or sends something): the confirm
   * button then reads as a warning.
   */
  destructive?: boolean;
}

/** Asks before a step with consequences; closes with true when the user goes ahead. */
@Component({
  selector: 'tb-confirm-dialog',
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
        [class.destructive]="data.destructive"
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
    .destructive {
      --mat-button-filled-container-color: var(--tb-danger);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ConfirmDialog {
  protected readonly data = inject<ConfirmDialogData>(MAT_DIALOG_DATA);
}

/** Asks `data` with the confirm dialog; true when the user goes ahead, false otherwise. */
export async function askToConfirm(
  dialog: MatDialog,
  data: ConfirmDialogData,
  width?: string,
): Promise<boolean> {
  return (
    (await dialogAnswer<boolean>(dialog, ConfirmDialog, { data, ...(width ? { width } : {}) })) ===
    true
  );
}
