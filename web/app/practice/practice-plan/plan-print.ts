import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { writtenKey, type PracticeStep } from '@shared/music';
import { keyWords } from '../labels';
import { instrumentInText } from '../instrument-label';
import { buildSheet } from '../sheet';
import type { SheetRequest } from '../sheet-request';
import { Staff } from '../staff/staff';

/** The practice plan as one page for a student's folder: every step with a small sheet. */
@Component({
  selector: 'tb-plan-print',
  imports: [Staff],
  templateUrl: './plan-print.html',
  styleUrl: './plan-print.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PlanPrint {
  /** The requirement the plan leads to. */
  readonly requirement = input.required<SheetRequest>();
  readonly steps = input.required<PracticeStep[]>();

  protected readonly heading = computed(() => {
    const requirement = this.requirement();
    const concert = { tonic: requirement.tonic, mode: requirement.mode };
    return (
      `Concert ${keyWords(concert)} for ${instrumentInText(requirement.instrument)} ` +
      `(written ${keyWords(writtenKey(concert, requirement.instrument))})`
    );
  });

  protected readonly rows = computed(() => {
    const requirement = this.requirement();
    return this.steps().map((step) => ({
      step,
      sheet: buildSheet({
        ...requirement,
        pattern: step.pattern,
        tempo: step.tempo,
        articulation: step.articulation,
        octaves: step.octaves,
      }),
    }));
  });
}
