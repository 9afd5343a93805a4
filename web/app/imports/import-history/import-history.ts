import { WhenPipe } from '../../core/format/formats';
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { dialogAnswer } from '../../core/confirm-dialog/dialog-answer';
import { toObservable, toSignal } from '@angular/core/rxjs-interop';
import { MatIconModule } from '@angular/material/icon';
import { catchError, map, of, startWith, switchMap } from 'rxjs';
import { importUndoDays, type ImportHistoryEntry, type ImportUndoResult } from '@shared/api/import';
import { PageState } from '../../core/state/page-state';
import { RosterImports } from '../roster-imports';
import { UndoDialog } from '../undo-dialog/undo-dialog';

type State =
  | { kind: 'loading' }
  | { kind: 'error' }
  | { kind: 'ready'; rows: ImportHistoryEntry[]; total: number };

const viaLabels: Record<ImportHistoryEntry['via'], string> = {
  wizard: 'Wizard',
  cli: 'tutti import',
  api: 'API',
};

/** Past imports: who ran them and when, what they did, and their error reports. */
@Component({
  selector: 'tb-import-history',
  imports: [WhenPipe, MatButtonModule, MatIconModule, PageState],
  template: `
    @if (undoneMessage(); as message) {
      <p class="undone-message" role="status" data-testid="undo-done">{{ message }}</p>
    }
    @switch (state().kind) {
      @case ('loading') {
        <tb-page-state kind="loading" title="Loading the import history…" />
      }
      @case ('error') {
        <tb-page-state
          kind="error"
          title="The import history could not be loaded"
          message="Reload the page to try again."
        />
      }
      @case ('ready') {
        @let list = ready()!;
        @if (list.rows.length === 0) {
          <tb-page-state
            kind="empty"
            icon="upload_file"
            title="No roster has been imported yet"
            message="Imports you run here or with tutti import are listed with who ran them, what they changed and their errors."
          />
        } @else {
          <table class="tb-card" data-testid="import-history">
            <thead>
              <tr>
                <th scope="col">When</th>
                <th scope="col">File</th>
                <th scope="col">By</th>
                <th scope="col">Result</th>
                <th scope="col" class="number">Rows</th>
                <th scope="col" class="number">New</th>
                <th scope="col" class="number">Changed</th>
                <th scope="col" class="number">Unchanged</th>
                <th scope="col" class="number">Withdrawn</th>
                <th scope="col">Errors</th>
                <th scope="col"><span class="tb-visually-hidden">Undo</span></th>
              </tr>
            </thead>
            <tbody>
              @for (entry of list.rows; track entry.id) {
                <tr>
                  <td>{{ entry.createdAt | when: 'dateTime' }}</td>
                  <td>
                    {{ entry.fileName }}
                    <span class="tb-muted"
                      >· {{ entry.source === 'oneroster' ? 'OneRoster' : 'CSV' }}</span
                    >
                  </td>
                  <td>
                    {{ entry.userName ?? viaLabels[entry.via] }}
                    @if (entry.userName) {
                      <span class="tb-muted">· {{ viaLabels[entry.via] }}</span>
                    }
                  </td>
                  <td>
                    @if (entry.undoneAt) {
                      <span
                        class="badge undone"
                        [title]="'Undone ' + (entry.undoneAt | when: 'dateTime')"
                        >Undone</span
                      >
                    } @else {
                      <span class="badge" [class.committed]="entry.committed">{{
                        entry.committed ? 'Committed' : 'Not committed'
                      }}</span>
                    }
                  </td>
                  <td class="number">{{ entry.rows }}</td>
                  <td class="number">{{ entry.created }}</td>
                  <td class="number">{{ entry.updated }}</td>
                  <td class="number">{{ entry.unchanged }}</td>
                  <td class="number">{{ entry.withdrawn }}</td>
                  <td>
                    @if (entry.errorCount > 0) {
                      <a [href]="imports.errorReportUrl(entry.id)" download
                        ><mat-icon svgIcon="download" aria-hidden="true" />{{ entry.errorCount }}
                        {{ entry.errorCount === 1 ? 'error' : 'errors' }} (CSV)</a
                      >
                    } @else {
                      <span class="tb-muted">None</span>
                    }
                  </td>
                  <td>
                    @if (undoable(entry)) {
                      <button
                        mat-stroked-button
                        type="button"
                        (click)="undo(entry)"
                        [attr.aria-label]="'Undo the import of ' + entry.fileName"
                        data-testid="undo-import"
                      >
                        Undo…
                      </button>
                    }
                  </td>
                </tr>
              }
            </tbody>
          </table>
          @if (list.total > list.rows.length) {
            <p class="tb-muted">
              The {{ list.rows.length }} most recent of {{ list.total }} imports.
            </p>
          }
        }
      }
    }
  `,
  styles: `
    table {
      width: 100%;
      border-collapse: collapse;
      padding: 0;
      font-size: 0.9rem;
    }
    th,
    td {
      text-align: left;
      padding: 8px 10px;
      border-bottom: 1px solid var(--tb-line);
    }
    .number {
      text-align: right;
      font-variant-numeric: tabular-nums;
    }
    .badge {
      padding: 2px 10px;
      border-radius: 999px;
      background: #ffdad6;
      color: #410002;
      white-space: nowrap;
    }
    .badge.undone {
      background: #e8e2d9;
      color: #3b3630;
    }
    .undone-message {
      margin: 0 0 12px;
      padding: 8px 12px;
      border-radius: 4px;
      background: #d7f0da;
      color: #0d3a13;
    }
    .badge.committed {
      background: #d7f0da;
      color: #0d3a13;
    }
    a {
      display: inline-flex;
      align-items: center;
      gap: 4px;
    }
    a mat-icon {
      width: 18px;
      height: 18px;
      fill: currentColor;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ImportHistory {
  protected readonly imports = inject(RosterImports);
  private readonly dialog = inject(MatDialog);
  /** Changes whenever the history should be read again (after a commit). */
  readonly refresh = input(0);
  private readonly undone = signal(0);
  protected readonly undoneMessage = signal('');

  protected readonly viaLabels = viaLabels;
  protected readonly state = toSignal(
    toObservable(computed(() => [this.refresh(), this.undone()])).pipe(
      switchMap(() =>
        this.imports.history({ limit: 100 }).pipe(
          map((list): State => ({ kind: 'ready', rows: list.rows, total: list.total })),
          catchError(() => of<State>({ kind: 'error' })),
          startWith<State>({ kind: 'loading' }),
        ),
      ),
    ),
    { initialValue: { kind: 'loading' } as State },
  );
  protected readonly ready = computed(() => {
    const state = this.state();
    return state.kind === 'ready' ? state : null;
  });

  /**
   * Whether to offer the undo: a committed import not undone, run within the window. The server
   * decides the rest (a later import of its schools, work recorded since) and the dialog says why.
   */
  protected undoable(entry: ImportHistoryEntry): boolean {
    if (!entry.committed || entry.undoneAt) return false;
    const age = Date.now() - new Date(entry.createdAt).getTime();
    return age < importUndoDays * 24 * 60 * 60 * 1000;
  }

  protected async undo(entry: ImportHistoryEntry): Promise<void> {
    this.undoneMessage.set('');
    const result = await dialogAnswer<ImportUndoResult>(this.dialog, UndoDialog, {
      data: entry,
      width: '560px',
      maxWidth: '95vw',
    });
    if (!result) return;
    const count = (value: number, one: string, many: string) =>
      `${value.toLocaleString('en-US')} ${value === 1 ? one : many}`;
    this.undoneMessage.set(
      `The import of “${result.fileName}” was undone: ${count(result.studentsRemoved, 'student', 'students')} removed, ${count(result.studentsRestored, 'student', 'students')} set back, ${count(result.withdrawalsReversed, 'withdrawal', 'withdrawals')} reversed, ${count(result.seatsRestored, 'seat', 'seats')} put back.`,
    );
    this.undone.update((value) => value + 1);
  }
}
