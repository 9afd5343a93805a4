import '../../core/screen-kit';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatSelectModule } from '@angular/material/select';
import { Router } from '@angular/router';
import type { ColDef } from 'ag-grid-community';
import {
  ensembleKindLabels,
  ensembleKinds,
  ensembleSortFields,
  type Ensemble,
} from '@shared/api/ensemble';
import { CurrentUser } from '../../core/auth/current-user';
import { GridSearch } from '../../core/grid/grid-search/grid-search';
import { ServerGrid } from '../../core/grid/server-grid';
import { gridSource } from '../../core/grid/grid-source';
import { column, orBlank } from '../../core/grid/grid-columns';
import { ListPage } from '../../core/list-page/list-page';
import { injectSchoolChoices } from '../../schools/school-choices';
import { SchoolFilter } from '../../schools/school-filter/school-filter';
import type { SchoolYear } from '@shared/api/school-year';
import { YearPicker } from '../../school-years/year-picker/year-picker';

const ensembleColumns: ColDef<Ensemble>[] = [
  column.field('name', 'Ensemble', { flex: 2, minWidth: 200 }, { sort: 'asc' }),
  column.derived('school', 'School', 170, (row) => row.schoolName),
  column.derived('kind', 'Kind', 160, (row) => row.kindLabel),
  column.formatted('level', 'Level', 120, (value: string | null) => {
    const level = String(value ?? '');
    return level.charAt(0).toUpperCase() + level.slice(1);
  }),
  column.formatted('directorName', 'Director', 160, orBlank('—')),
  column.field('meetingPeriod', 'Meets', 130),
  column.amount('memberCount', 'Members', 110),
];

/** The ensembles of the user's schools, filtered by school and kind. */
@Component({
  selector: 'tb-ensemble-list',
  imports: [
    ListPage,
    ServerGrid,
    GridSearch,
    MatFormFieldModule,
    MatSelectModule,
    SchoolFilter,
    YearPicker,
  ],
  templateUrl: './ensemble-list.html',
  styles: `
    mat-form-field {
      width: 220px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class EnsembleList {
  private readonly router = inject(Router);
  protected readonly canWrite = inject(CurrentUser).can('roster:write');
  protected readonly schools = injectSchoolChoices();
  protected readonly kinds = ensembleKinds;
  protected readonly kindLabels = ensembleKindLabels;
  protected readonly search = signal('');
  protected readonly schoolId = signal<number | null>(null);
  protected readonly kind = signal<string | null>(null);
  /** A past year chosen in the year picker (that year's members, read-only), or null for now. */
  protected readonly pastYear = signal<SchoolYear | null>(null);
  protected readonly pastYearLead = computed(() => {
    const year = this.pastYear();
    return year ? `The ensembles with their members in ${year.name}.` : null;
  });
  protected readonly filters = computed(() => ({
    schoolId: this.schoolId(),
    kind: this.kind(),
    schoolYearId: this.pastYear()?.id ?? null,
  }));
  protected readonly source = gridSource(
    'ensembles',
    'ensemble',
    ensembleSortFields,
    ensembleColumns,
    {
      emptyMessage: 'Clear the search or the filters, or add an ensemble for the school.',
    },
  );

  protected open(ensemble: Ensemble): void {
    void this.router.navigate(['/ensembles', ensemble.id]);
  }
}
