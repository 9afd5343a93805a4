import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialog, MatDialogModule } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { of } from 'rxjs';
import { draftNameMark, type Ladder, type LadderImpactGroup } from '@shared/api/ladder';
import { errorMessage } from '../../core/parse';
import { gradeText } from '../date-text';
import { LadderData } from '../ladder-data';
import { createDialogSave } from '../../core/state/dialog-save';
import { dialogAnswer } from '../../core/confirm-dialog/dialog-answer';
import { DialogActions } from '../../core/dialog-actions/dialog-actions';

/** What the impact dialog puts in force. */
export interface ImpactDialogData {
  versionId: number;
  /** A draft is published under a name of its own; an earlier version is put back as it was. */
  mode: 'publish' | 'restore';
  /** The version's name now (a draft's carries "(draft)"). */
  name: string;
}

type Move = 'up' | 'down' | 'same';

/**
 * Puts a ladder version in force through the impact dialog, then says so in a snack bar: the
 * returned function answers the ladder now in force, or undefined when the user cancelled. Call
 * it in an injection context (a field initialiser).
 */
export function injectPutInForce(): (data: ImpactDialogData) => Promise<Ladder | undefined> {
  const dialog = inject(MatDialog);
  const snackBar = inject(MatSnackBar);
  return async (data) => {
    const ladder = await dialogAnswer<Ladder>(dialog, ImpactDialog, {
      data,
      width: '720px',
      maxHeight: '90vh',
    });
    if (ladder) {
      const news =
        data.mode === 'publish' ? 'is now the ladder in force' : 'is the ladder in force again';
      snackBar.open(`“${ladder.name}” ${news}.`, 'Close', { duration: 6000 });
    }
    return ladder;
  };
}

/**
 * Shows what putting a ladder version in force does to every student's rung (by school and
 * grade, with the names behind each figure) and to the benchmark share, then puts it in force.
 * Closes with the version in force, or nothing when cancelled.
 */
@Component({
  selector: 'tb-impact-dialog',
  imports: [
    DialogActions,
    MatButtonModule,
    MatDialogModule,
    MatFormFieldModule,
    MatInputModule,
    MatProgressBarModule,
  ],
  templateUrl: './impact-dialog.html',
  styleUrl: './impact-dialog.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ImpactDialog {
  private readonly dialogSave = createDialogSave<Ladder>();
  private readonly ladderData = inject(LadderData);
  protected readonly data = inject<ImpactDialogData>(MAT_DIALOG_DATA);

  protected readonly impact = rxResource({
    params: () => this.data.versionId,
    stream: ({ params }) => this.ladderData.impact(params),
  });
  protected readonly name = signal(
    this.data.name
      .replace(draftNameMark, '')
      .replace(/\s{2,}/g, ' ')
      .trim(),
  );
  protected readonly nameProblem = computed(() => {
    if (this.data.mode !== 'publish') return '';
    const name = this.name().trim();
    if (!name) return 'Give the version a name.';
    if (draftNameMark.test(name))
      return 'A published version takes a name of its own, without “(draft)”.';
    return '';
  });
  protected readonly drill = signal<{ group: LadderImpactGroup; move: Move } | null>(null);
  protected readonly drilled = rxResource({
    params: () => this.drill(),
    stream: ({ params }) =>
      params
        ? this.ladderData.impactStudents(this.data.versionId, {
            schoolId: params.group.schoolId,
            grade: params.group.grade,
            move: params.move,
          })
        : of([]),
  });
  protected readonly busy = this.dialogSave.saving;
  protected readonly problem = this.dialogSave.failure;
  protected readonly gradeText = gradeText;

  protected percent(share: number | null): string {
    return share === null ? '—' : `${Math.round(share * 100)}%`;
  }

  /** The moves whose counts open the names; those staying are counted only. */
  protected readonly countedMoves: readonly Move[] = ['up', 'down'];

  protected moveWords(move: Move): string {
    return move === 'up' ? 'moving up' : move === 'down' ? 'moving down' : 'staying';
  }

  protected show(group: LadderImpactGroup, move: Move): void {
    this.drill.set({ group, move });
  }

  protected rungText(rung: number): string {
    return rung === 0 ? 'none' : String(rung);
  }

  protected confirm(): void {
    const impact = this.impact.value();
    if (!impact || this.nameProblem() || this.busy()) return;
    const request =
      this.data.mode === 'publish'
        ? this.ladderData.publish(this.data.versionId, this.name().trim(), impact.token)
        : this.ladderData.restore(this.data.versionId, impact.token);
    this.dialogSave.send(request, (error) => {
      this.impact.reload();
      return errorMessage(error, 'The ladder could not be put in force.');
    });
  }
}
