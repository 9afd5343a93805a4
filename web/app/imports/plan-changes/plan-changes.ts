import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import type { FieldChange, PlanSummary } from '../../../../shared/api/import';
import { formatGradeLevel } from '../../../../shared/roster/grade-level';
import { rosterFieldLabels } from '../../../../shared/roster/roster-columns';

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

  protected fieldLabel(change: FieldChange): string {
    if (change.field === 'status') return 'Status';
    if (change.field === 'ensemble') return 'Joins';
    if (change.field === 'instrument') return `Instrument in ${change.ensemble}`;
    return rosterFieldLabels[change.field];
  }
}
