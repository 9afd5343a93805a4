import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import type { Instrument } from '@shared/api/instrument';
import type { SchoolSummary } from '@shared/api/me';
import { InstrumentForm } from './instrument-form';

/** What the add-instrument dialog needs. */
export interface InstrumentFormDialogData {
  schools: SchoolSummary[];
}

/** Adds one instrument to the fleet; closes with the new instrument. */
@Component({
  selector: 'tb-instrument-form-dialog',
  imports: [InstrumentForm, MatButtonModule, MatDialogModule],
  template: `
    <mat-dialog-content>
      <tb-instrument-form
        [schools]="data.schools"
        [editable]="true"
        (saved)="dialog.close($event)"
      />
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button mat-button type="button" mat-dialog-close>Cancel</button>
    </mat-dialog-actions>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class InstrumentFormDialog {
  protected readonly data = inject<InstrumentFormDialogData>(MAT_DIALOG_DATA);
  protected readonly dialog = inject<MatDialogRef<InstrumentFormDialog, Instrument>>(MatDialogRef);
}
