import { ChangeDetectionStrategy, Component, computed, inject, model } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatSelectModule } from '@angular/material/select';
import { map } from 'rxjs';
import type { SchoolYear } from '@shared/api/school-year';
import { SchoolYearData } from '../school-year-data';

/**
 * The school-year picker the year-aware screens share: the current year by default, any past
 * year as read-only history. `pastYear` is the past year chosen, or null for the current one.
 * Shows nothing while the district has a single year.
 */
@Component({
  selector: 'tb-year-picker',
  imports: [MatFormFieldModule, MatSelectModule],
  template: `
    @if (years().length > 1) {
      <mat-form-field appearance="outline" subscriptSizing="dynamic" class="year">
        <mat-label>School year</mat-label>
        <mat-select
          [value]="pastYear()?.id ?? currentYear()?.id"
          (selectionChange)="choose($event.value)"
          data-testid="filter-year"
        >
          @for (year of years(); track year.id) {
            <mat-option [value]="year.id"
              >{{ year.name }}{{ year.current ? ' (now)' : '' }}</mat-option
            >
          }
        </mat-select>
      </mat-form-field>
    }
  `,
  styles: `
    .year {
      width: 160px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class YearPicker {
  private readonly data = inject(SchoolYearData);

  /** The past year chosen, or null for the current year. */
  readonly pastYear = model<SchoolYear | null>(null);

  private readonly list = rxResource({
    stream: () => this.data.list().pipe(map((list) => [...list.rows].reverse())),
  });
  /** Newest first. */
  protected readonly years = computed(() => (this.list.hasValue() ? this.list.value() : []));
  protected readonly currentYear = computed(() => this.years().find((year) => year.current));

  protected choose(id: number): void {
    const year = this.years().find((row) => row.id === id);
    this.pastYear.set(year && !year.current ? year : null);
  }
}
