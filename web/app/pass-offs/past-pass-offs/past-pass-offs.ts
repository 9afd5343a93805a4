import '../../core/screen-kit';
import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { Router } from '@angular/router';
import type { ColDef } from 'ag-grid-community';
import { passOffSortFields, type PassOff } from '@shared/api/pass-off';
import type { SchoolYear } from '@shared/api/school-year';
import { ServerGrid } from '../../core/grid/server-grid';

/**
 * The pass-offs heard in a past school year, read-only: history is read, not changed, so there
 * is no entry grid and no editing, only the list (a row opens the student).
 */
@Component({
  selector: 'tb-past-pass-offs',
  imports: [ServerGrid],
  template: `
    <p class="tb-muted note" data-testid="past-year-note">
      The pass-offs your students heard in {{ year().name }} ({{ year().startsOn }} to
      {{ year().endsOn }}), wherever they played then. Past years are history: read, not changed.
    </p>
    <tb-server-grid
      endpoint="/api/pass-offs"
      gridId="past-pass-offs"
      label="Pass-offs of a past year"
      itemName="pass-off"
      openLabel="Open the student"
      [columns]="columns"
      [sortFields]="sortFields"
      [filters]="filters()"
      emptyTitle="No pass-offs that year"
      emptyMessage="Nothing was heard in your schools in that year."
      (rowOpened)="open($event)"
    />
  `,
  styles: `
    .note {
      margin: 0 0 12px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PastPassOffs {
  private readonly router = inject(Router);

  readonly year = input.required<SchoolYear>();

  protected readonly filters = computed(() => ({
    from: this.year().startsOn,
    to: this.year().endsOn,
  }));
  protected readonly sortFields = passOffSortFields;
  protected readonly columns: ColDef<PassOff>[] = [
    { field: 'heardOn', headerName: 'Heard on', width: 120, sort: 'desc' },
    { field: 'studentName', headerName: 'Student', flex: 1, minWidth: 160 },
    { field: 'requirementCode', headerName: 'Requirement', width: 150 },
    {
      field: 'tempo',
      headerName: 'Tempo',
      width: 100,
      type: 'rightAligned',
      valueFormatter: ({ value }) => (value ? `♩ = ${value}` : ''),
    },
    {
      field: 'passed',
      headerName: 'Result',
      width: 100,
      sortable: false,
      valueFormatter: ({ value }) => (value ? 'Passed' : 'Not yet'),
    },
    { field: 'heardByName', headerName: 'Heard by', width: 170, sortable: false },
    { field: 'note', headerName: 'Note', flex: 1, minWidth: 160, sortable: false },
  ];

  protected open(passOff: PassOff): void {
    void this.router.navigate(['/students', passOff.studentId]);
  }
}
