import '../../core/screen-kit';
import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { Router } from '@angular/router';
import type { ColDef } from 'ag-grid-community';
import { passOffSortFields, type PassOff } from '@shared/api/pass-off';
import type { SchoolYear } from '@shared/api/school-year';
import { ServerGrid } from '../../core/grid/server-grid';
import { gridSource } from '../../core/grid/grid-source';
import { column } from '../../core/grid/grid-columns';

const columns: ColDef<PassOff>[] = [
  column.field('heardOn', 'Heard on', 120, { sort: 'desc' }),
  column.field('studentName', 'Student', { flex: 1, minWidth: 160 }),
  column.field('requirementCode', 'Requirement', 150),
  column.amount('tempo', 'Tempo', 100, (tempo: number | null) => (tempo ? `♩ = ${tempo}` : '')),
  column.formatted('passed', 'Result', 100, (passed: boolean) => (passed ? 'Passed' : 'Not yet'), {
    sortable: false,
  }),
  column.field('heardByName', 'Heard by', 170, { sortable: false }),
  column.field('note', 'Note', { flex: 1, minWidth: 160 }, { sortable: false }),
];

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
      [source]="source"
      openLabel="Open the student"
      [filters]="filters()"
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
  protected readonly source = gridSource('pass-offs', 'pass-off', passOffSortFields, columns, {
    gridId: 'past-pass-offs',
    label: 'Pass-offs of a past year',
    emptyTitle: 'No pass-offs that year',
    emptyMessage: 'Nothing was heard in your schools in that year.',
  });

  protected open(passOff: PassOff): void {
    void this.router.navigate(['/students', passOff.studentId]);
  }
}
