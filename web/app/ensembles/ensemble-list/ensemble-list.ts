import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatSelectModule } from '@angular/material/select';
import { Router, RouterLink } from '@angular/router';
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
import { injectSchoolChoices } from '../../schools/school-choices';
import { SchoolFilter } from '../../schools/school-filter/school-filter';

/** The ensembles of the user's schools, filtered by school and kind. */
import type { SchoolYear } from '@shared/api/school-year';
import { YearPicker } from '../../school-years/year-picker/year-picker';

@Component({
  selector: 'tb-ensemble-list',
  imports: [
    ServerGrid,
    GridSearch,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatSelectModule,
    RouterLink,
    SchoolFilter,
    YearPicker,
  ],
  templateUrl: './ensemble-list.html',
  styles: `
    .filters {
      display: flex;
      flex-wrap: wrap;
      gap: 12px;
    }
    .search {
      width: 280px;
    }
    .filters mat-form-field:not(.search) {
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
  protected readonly filters = computed(() => ({
    schoolId: this.schoolId(),
    kind: this.kind(),
    schoolYearId: this.pastYear()?.id ?? null,
  }));
  protected readonly sortFields = ensembleSortFields;
  protected readonly columns: ColDef<Ensemble>[] = [
    { field: 'name', headerName: 'Ensemble', flex: 2, minWidth: 200, sort: 'asc' },
    {
      colId: 'school',
      headerName: 'School',
      width: 170,
      valueGetter: ({ data }) => data?.schoolName,
    },
    { colId: 'kind', headerName: 'Kind', width: 160, valueGetter: ({ data }) => data?.kindLabel },
    {
      field: 'level',
      headerName: 'Level',
      width: 120,
      valueFormatter: ({ value }) => {
        const level = String(value ?? '');
        return level.charAt(0).toUpperCase() + level.slice(1);
      },
    },
    {
      field: 'directorName',
      headerName: 'Director',
      width: 160,
      valueFormatter: ({ value }) => value ?? '—',
    },
    { field: 'meetingPeriod', headerName: 'Meets', width: 130 },
    {
      colId: 'memberCount',
      field: 'memberCount',
      headerName: 'Members',
      width: 110,
      type: 'rightAligned',
    },
  ];

  protected open(ensemble: Ensemble): void {
    void this.router.navigate(['/ensembles', ensemble.id]);
  }
}
