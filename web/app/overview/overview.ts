import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { RouterLink } from '@angular/router';
import { DecimalPipe } from '@angular/common';
import { catchError, map, of, startWith } from 'rxjs';
import { MatIconModule } from '@angular/material/icon';
import { CurrentUser } from '../core/auth/current-user';
import { PageState } from '../core/state/page-state';
import { SchoolData } from '../schools/school-data';
import type { School } from '../../../shared/api/school';

type SchoolsState = { kind: 'loading' } | { kind: 'error' } | { kind: 'ready'; schools: School[] };

/** The district (or a director's school) at a glance. */
@Component({
  selector: 'tb-overview',
  imports: [PageState, RouterLink, MatIconModule, DecimalPipe],
  templateUrl: './overview.html',
  styleUrl: './overview.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Overview {
  private readonly schoolData = inject(SchoolData);
  protected readonly me = inject(CurrentUser).me;

  protected readonly schools = toSignal(
    this.schoolData.list({ limit: 200, sort: 'name:asc' }).pipe(
      map((list): SchoolsState => ({ kind: 'ready', schools: list.rows })),
      catchError(() => of<SchoolsState>({ kind: 'error' })),
      startWith<SchoolsState>({ kind: 'loading' }),
    ),
    { requireSync: true },
  );

  protected totalStudents(schools: School[]): number {
    return schools.reduce((sum, school) => sum + (school.studentCount ?? 0), 0);
  }
}
