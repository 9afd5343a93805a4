import '../../core/screen-kit';
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { Router, RouterLink } from '@angular/router';
import type { ColDef } from 'ag-grid-community';
import { gradesServedLabel, type School } from '@shared/api/school';
import { CurrentUser } from '../../core/auth/current-user';
import { GridSearch } from '../../core/grid/grid-search/grid-search';
import { ServerGrid } from '../../core/grid/server-grid';
import { schoolLevelLabels, schoolSortFields } from '../school-labels';

/** Every school the user may see, in a server-paged grid. */
@Component({
  selector: 'tb-school-list',
  imports: [ServerGrid, GridSearch, MatButtonModule, MatIconModule, RouterLink],
  template: `
    <div class="tb-page">
      <header class="tb-page-header">
        <div>
          <h1>Schools</h1>
          <p>Schools, their music students and ensembles. Open a school to see its details.</p>
        </div>
        @if (canWrite) {
          <a mat-flat-button routerLink="/schools/new"><mat-icon svgIcon="add" />Add school</a>
        }
      </header>
      <tb-server-grid
        endpoint="/api/schools"
        gridId="schools"
        label="Schools"
        itemName="school"
        [columns]="columns"
        [sortFields]="sortFields"
        [quickSearch]="search()"
        emptyTitle="No schools match"
        emptyMessage="Clear the search to see every school."
        (rowOpened)="open($event)"
      >
        <div tbGridFilters class="filters">
          <tb-grid-search
            class="search"
            label="Search schools"
            placeholder="Name or code"
            [(value)]="search"
          />
        </div>
      </tb-server-grid>
    </div>
  `,
  styles: `
    .filters {
      display: flex;
      gap: 12px;
    }
    .search {
      width: 320px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SchoolList {
  private readonly router = inject(Router);
  protected readonly canWrite = inject(CurrentUser).can('schools:write');
  protected readonly search = signal('');
  protected readonly sortFields = schoolSortFields;
  protected readonly columns: ColDef<School>[] = [
    { field: 'code', headerName: 'Code', width: 110 },
    { field: 'name', headerName: 'School', flex: 2, minWidth: 220, sort: 'asc' },
    {
      field: 'level',
      headerName: 'Level',
      width: 140,
      valueFormatter: ({ value }) =>
        schoolLevelLabels[value as School['level']] ?? String(value ?? ''),
    },
    {
      colId: 'grades',
      headerName: 'Grades',
      width: 110,
      sortable: false,
      valueGetter: ({ data }) => (data ? gradesServedLabel(data) : ''),
    },
    {
      colId: 'sendsTo',
      headerName: 'Students move up to',
      flex: 1,
      minWidth: 180,
      sortable: false,
      valueGetter: ({ data }) => data?.sendsTo?.name ?? '',
    },
    {
      field: 'closedOn',
      headerName: 'Status',
      width: 150,
      sortable: false,
      valueFormatter: ({ value }) => (value ? `Closed ${value}` : 'Open'),
    },
    { field: 'studentCount', headerName: 'Students', width: 130, type: 'rightAligned' },
    { field: 'ensembleCount', headerName: 'Ensembles', width: 130, type: 'rightAligned' },
  ];

  protected open(school: School): void {
    void this.router.navigate(['/schools', school.id]);
  }
}
