import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import type { FieldChange, PlannedUpdate, PlanSummary } from '@shared/api/import';
import { formatGradeLevel } from '@shared/roster/grade-level';
import { rosterFieldLabels } from '@shared/roster/roster-columns';
import { describeSeatMoves } from '@shared/roster/seat-moves';

/** One line of a student's changes: a field's before and after, or their ensemble moves. */
interface ChangeLine {
  label: string;
  before: string | null;
  after: string | null;
  /** The ensembles left and joined, in one sentence, instead of before and after. */
  moves?: string;
}

/** What an import will do: the counts, and who is created, changed (field by field) or withdrawn. */
@Component({
  selector: 'tb-plan-changes',
  templateUrl: './plan-changes.html',
  styleUrl: './plan-changes.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PlanChanges {
  readonly plan = input.required<PlanSummary>();
  readonly errorCount = input(0);

  protected readonly grade = formatGradeLevel;

  protected kindLabel(kind: string): string {
    return kind.replaceAll('-', ' ');
  }

  /** A student's changes, their ensemble seats left and joined as one line. */
  protected linesOf(student: PlannedUpdate): ChangeLine[] {
    const lines: ChangeLine[] = student.changes
      .filter((change) => change.field !== 'ensemble')
      .map((change) => ({
        label: this.fieldLabel(change),
        before: change.before,
        after: change.after,
      }));
    const moves = describeSeatMoves(student.changes);
    if (moves) lines.push({ label: 'Ensembles', before: null, after: null, moves });
    return lines;
  }

  private fieldLabel(change: FieldChange): string {
    if (change.field === 'status') return 'Status';
    if (change.field === 'instrument') return `Instrument in ${change.ensemble}`;
    return rosterFieldLabels[change.field as Exclude<FieldChange['field'], 'status'>];
  }
}
