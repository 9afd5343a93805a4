import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { catchError, map, of, startWith } from 'rxjs';
import { PageState } from '../../core/state/page-state';
import { SchoolData } from '../school-data';
import type { School } from '../../../../shared/api/school';

type State = { kind: 'loading' } | { kind: 'error' } | { kind: 'ready'; rows: School[] };

/** Every school the user may see. */
@Component({
  selector: 'tb-school-list',
  imports: [PageState],
  template: `
    <div class="tb-page">
      <header class="tb-page-header"><div><h1>Schools</h1><p>Schools, their music students and ensembles.</p></div></header>
      @switch (state().kind) {
        @case ('loading') { <tb-page-state kind="loading" title="Loading schools…" /> }
        @case ('error') { <tb-page-state kind="error" title="The schools could not be loaded" message="Reload the page to try again." /> }
        @case ('ready') {
          <table class="tb-card">
            <thead><tr><th scope="col">Code</th><th scope="col">School</th><th scope="col">Level</th><th scope="col">Students</th><th scope="col">Ensembles</th></tr></thead>
            <tbody>
              @for (school of $any(state()).rows; track school.id) {
                <tr><td>{{ school.code }}</td><td>{{ school.name }}</td><td>{{ school.level }}</td><td>{{ school.studentCount }}</td><td>{{ school.ensembleCount }}</td></tr>
              }
            </tbody>
          </table>
        }
      }
    </div>
  `,
  styles: `table { width: 100%; border-collapse: collapse; } th, td { text-align: left; padding: 8px 12px; border-bottom: 1px solid var(--tb-line); }`,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SchoolList {
  private readonly schoolData = inject(SchoolData);
  protected readonly state = toSignal(
    this.schoolData.list({ limit: 500 }).pipe(
      map((list): State => ({ kind: 'ready', rows: list.rows })),
      catchError(() => of<State>({ kind: 'error' })),
      startWith<State>({ kind: 'loading' }),
    ),
    { requireSync: true },
  );
}
