import '../../core/screen-kit';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatIconModule } from '@angular/material/icon';
import { ResourceState } from '../../core/state/resource-state';
import { dayText, money } from '../../instruments/instrument-labels';
import { FleetPlanning } from '../planning-data';
import { ReplacementTable } from '../replacement-table/replacement-table';
import { ShortageList } from '../shortage-list/shortage-list';

/** What to replace in the next 1, 3 or 5 years and what it costs; shortages and transfers. */
@Component({
  selector: 'tb-planning-page',
  imports: [MatButtonToggleModule, MatIconModule, ResourceState, ReplacementTable, ShortageList],
  templateUrl: './planning-page.html',
  styleUrl: './planning-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PlanningPage {
  private readonly planning = inject(FleetPlanning);

  protected readonly plan = this.planning.replacement();
  protected readonly shortages = this.planning.shortages();
  protected readonly years = signal(1);
  protected readonly money = money;
  protected readonly day = dayText;

  protected readonly horizon = computed(() => {
    if (!this.plan.hasValue()) return null;
    return this.plan.value().horizons.find((horizon) => horizon.years === this.years()) ?? null;
  });
  protected readonly dueLines = computed(() => {
    if (!this.plan.hasValue()) return [];
    return this.plan
      .value()
      .lines.filter((line) => line.dueWithinYears !== null && line.dueWithinYears <= this.years())
      .sort((first, second) => first.replaceBy.localeCompare(second.replaceBy));
  });
}
