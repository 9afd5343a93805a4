import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import type { PracticeStep } from '@shared/music';

/** The steps toward a requirement, each one a sheet the student can open. */
@Component({
  selector: 'tb-plan-panel',
  imports: [MatButtonModule, MatIconModule],
  templateUrl: './plan-panel.html',
  styleUrl: './plan-panel.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PlanPanel {
  readonly steps = input.required<PracticeStep[]>();
  /** The id of the step on the sheet, or null when the sheet shows the requirement itself. */
  readonly shownStep = input<string | null>(null);
  /** Asks to show a step's sheet. */
  readonly showStep = output<string>();
  /** Asks for the plan's print layout. */
  readonly printPlan = output();
}
