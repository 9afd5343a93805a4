import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import {
  importUndoPreviewSchema,
  type ImportHistoryEntry,
  type ImportUndoResult,
} from '@shared/api/import';
import { WhenPipe } from '../../core/format/formats';
import { errorMessage } from '../../core/parse';
import { RosterImports } from '../roster-imports';
import { createWrite } from '../../core/state/write';

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
  private readonly write = createWrite();
  private readonly imports = inject(RosterImports);
  private readonly dialogRef = inject<MatDialogRef<UndoDialog, ImportUndoResult>>(MatDialogRef);
  protected readonly entry = inject<ImportHistoryEntry>(MAT_DIALOG_DATA);

  protected readonly preview = httpResource(() => `/api/imports/${this.entry.id}/undo`, {
    parse: (body) => importUndoPreviewSchema.parse(body),
  });
  protected readonly busy = signal(false);
  protected readonly problem = signal('');

  protected count(count: number, one: string, many: string): string {
    return `${count.toLocaleString('en-US')} ${count === 1 ? one : many}`;
  }

  protected confirm(): void {
    if (!this.preview.value()?.canUndo || this.busy()) return;
    this.busy.set(true);
    this.problem.set('');
    this.write.send(this.imports.undo(this.entry.id), {
      next: (result) => this.dialogRef.close(result),
      error: (error: unknown) => {
        this.busy.set(false);
        this.problem.set(errorMessage(error, 'The import could not be undone.'));
        this.preview.reload();
      },
    });
  }
}
