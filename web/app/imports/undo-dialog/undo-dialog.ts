import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule } from '@angular/material/dialog';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import {
  importUndoPreviewSchema,
  type ImportHistoryEntry,
  type ImportUndoResult,
} from '@shared/api/import';
import { WhenPipe } from '../../core/format/formats';
import { errorMessage } from '../../core/parse';
import { RosterImports } from '../roster-imports';
import { createDialogSave } from '../../core/state/dialog-save';

/**
 * Shows what undoing an import will do (students removed, fields and withdrawals restored, seats
 * put back) or what blocks it, then undoes it, all or nothing. Closes with the undo's result, or
 * nothing when cancelled.
 */
@Component({
  selector: 'tb-undo-dialog',
  imports: [MatButtonModule, MatDialogModule, MatProgressBarModule, WhenPipe],
  templateUrl: './undo-dialog.html',
  styleUrl: './undo-dialog.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class UndoDialog {
  private readonly dialogSave = createDialogSave<ImportUndoResult>();
  private readonly imports = inject(RosterImports);
  protected readonly entry = inject<ImportHistoryEntry>(MAT_DIALOG_DATA);

  protected readonly preview = httpResource(() => `/api/imports/${this.entry.id}/undo`, {
    parse: (body) => importUndoPreviewSchema.parse(body),
  });
  protected readonly busy = this.dialogSave.saving;
  protected readonly problem = this.dialogSave.failure;

  protected count(count: number, one: string, many: string): string {
    return `${count.toLocaleString('en-US')} ${count === 1 ? one : many}`;
  }

  protected confirm(): void {
    if (!this.preview.value()?.canUndo || this.busy()) return;
    this.dialogSave.send(this.imports.undo(this.entry.id), (error) => {
      this.preview.reload();
      return errorMessage(error, 'The import could not be undone.');
    });
  }
}
