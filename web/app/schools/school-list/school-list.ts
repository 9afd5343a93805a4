import '../../core/screen-kit';
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { Router } from '@angular/router';
import type { ColDef } from 'ag-grid-community';
import { gradesServedLabel, type School } from '@shared/api/school';
import { CurrentUser } from '../../core/auth/current-user';
import { GridSearch } from '../../core/grid/grid-search/grid-search';
import { ServerGrid } from '../../core/grid/server-grid';
import { gridSource } from '../../core/grid/grid-source';
import { column } from '../../core/grid/grid-columns';
import { ListPage } from '../../core/list-page/list-page';
import { schoolLevelLabels, schoolSortFields } from '../school-labels';

const schoolColumns: ColDef<School>[] = [
  column.field('code', 'Code', 110),
  column.field('name', 'School', { flex: 2, minWidth: 220 }, { sort: 'asc' }),
  column.formatted(
    'level',
    'Level',
    140,
    (value: School['level']) => schoolLevelLabels[value] ?? String(value ?? ''),
  ),
  column.derived('grades', 'Grades', 110, (row) => gradesServedLabel(row), { sortable: false }),
  column.derived(
    'sendsTo',
    'Students move up to',
    { flex: 1, minWidth: 180 },
    (row) => row.sendsTo?.name ?? '',
    { sortable: false },
  ),
  column.formatted(
    'closedOn',
    'Status',
    150,
    (closedOn: string | null) => (closedOn ? `Closed ${closedOn}` : 'Open'),
    { sortable: false },
  ),
  column.amount('studentCount', 'Students', 130),
  column.amount('ensembleCount', 'Ensembles', 130),
];

/** Every school the user may see, in a server-paged grid. */
@Component({
  selector: 'tb-school-list',
  imports: [ListPage, ServerGrid, GridSearch],
  template: `
    <tb-list-page
      heading="Schools"
      lead="Schools, their music students and ensembles. Open a school to see its details."
      [addItem]="canWrite ? 'school' : null"
    >
      <tb-server-grid [source]="source" [quickSearch]="search()" (rowOpened)="open($event)">
        <div tbGridFilters class="tb-list-filters">
          <tb-grid-search
            width="320px"
            label="Search schools"
            placeholder="Name or code"
            [(value)]="search"
          />
        </div>
      </tb-server-grid>
    </tb-list-page>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SchoolList {
  private readonly router = inject(Router);
  protected readonly canWrite = inject(CurrentUser).can('schools:write');
  protected readonly search = signal('');
  protected readonly source = gridSource('schools', 'school', schoolSortFields, schoolColumns, {
    emptyMessage: 'Clear the search to see every school.',
  });

  protected open(school: School): void {
    void this.router.navigate(['/schools', school.id]);
  }
}
