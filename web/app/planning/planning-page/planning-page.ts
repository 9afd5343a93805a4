import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatIconModule } from '@angular/material/icon';
import type { ReplacementPlan, ShortageReport } from '@shared/api/planning';
import { errorMessage } from '../../core/parse';
import { PageState } from '../../core/state/page-state';
import { dayText, money } from '../../instruments/instrument-labels';
import { FleetPlanning } from '../planning-data';
import { ReplacementTable } from '../replacement-table/replacement-table';
import { ShortageList } from '../shortage-list/shortage-list';

type Load<Value> =
  { kind: 'loading' } | { kind: 'error'; message: string } | { kind: 'ready'; value: Value };

/** What to replace in the next 1, 3 or 5 years and what it costs; shortages and transfers. */
@Component({
  selector: 'tb-planning-page',
  imports: [MatButtonToggleModule, MatIconModule, PageState, ReplacementTable, ShortageList],
  templateUrl: './planning-page.html',
  styleUrl: './planning-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PlanningPage {
  private readonly planning = inject(FleetPlanning);

  protected readonly plan = signal<Load<ReplacementPlan>>({ kind: 'loading' });
  protected readonly shortages = signal<Load<ShortageReport>>({ kind: 'loading' });
  protected readonly years = signal(1);
  protected readonly money = money;
  protected readonly day = dayText;

  protected readonly horizon = computed(() => {
    const plan = this.plan();
    if (plan.kind !== 'ready') return null;
    return plan.value.horizons.find((horizon) => horizon.years === this.years()) ?? null;
  });
  protected readonly dueLines = computed(() => {
    const plan = this.plan();
    if (plan.kind !== 'ready') return [];
    return plan.value.lines
      .filter((line) => line.dueWithinYears !== null && line.dueWithinYears <= this.years())
      .sort((first, second) => first.replaceBy.localeCompare(second.replaceBy));
  });

  constructor() {
    this.planning.replacement().subscribe({
      next: (value) => this.plan.set({ kind: 'ready', value }),
      error: (error: unknown) =>
        this.plan.set({ kind: 'error', message: errorMessage(error, 'Try again.') }),
    });
    this.planning.shortages().subscribe({
      next: (value) => this.shortages.set({ kind: 'ready', value }),
      error: (error: unknown) =>
        this.shortages.set({ kind: 'error', message: errorMessage(error, 'Try again.') }),
    });
  }
}
