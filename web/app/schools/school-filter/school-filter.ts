import { ChangeDetectionStrategy, Component, computed, input, model } from '@angular/core';
import type { School } from '@shared/api/school';
import { FilterSelect, namedChoices } from '../../core/grid/filter-select/filter-select';

/**
 * The school filter of a list screen (`<div tbGridFilters>`): offered only to a user with more
 * than one school, its first choice "All schools" (null) lists every row. The page hands over
 * the schools it read with `injectSchoolChoices()`, so the list is read once.
 */
@Component({
  selector: 'tb-school-filter',
  imports: [FilterSelect],
  template: `
    @if (schools().length > 1) {
      <tb-filter-select
        [width]="width()"
        [label]="label()"
        anyLabel="All schools"
        testId="filter-school"
        [choices]="choices()"
        [(value)]="value"
      />
    }
  `,
  // No box of its own: the form field is the filters' flex item.
  styles: ':host { display: contents; }',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SchoolFilter {
  readonly schools = input.required<readonly School[]>();
  /** The field's label: "School", or "Home school" for the fleet. */
  readonly label = input('School');
  /** The field's width as a CSS length. */
  readonly width = input('210px');
  /** The chosen school's id, or null for every school. */
  readonly value = model<number | null>(null);

  protected readonly choices = computed(() => namedChoices(this.schools()));
}
