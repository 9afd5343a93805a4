import '../../core/screen-kit';
import { NgTemplateOutlet } from '@angular/common';
import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  TemplateRef,
  computed,
  effect,
  inject,
  input,
  signal,
  untracked,
  viewChild,
} from '@angular/core';
import { takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
import { BreakpointObserver } from '@angular/cdk/layout';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog, MatDialogModule, type MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { Router, RouterLink } from '@angular/router';
import type {
  CellClickedEvent,
  CellFocusedEvent,
  CellKeyDownEvent,
  FullWidthCellKeyDownEvent,
  GridApi,
  GridReadyEvent,
} from 'ag-grid-community';
import { map } from 'rxjs';
import type { Ensemble } from '@shared/api/ensemble';
import type { Ladder, LadderRequirement } from '@shared/api/ladder';
import type { PassOff } from '@shared/api/pass-off';
import { CurrentUser } from '../../core/auth/current-user';
import { errorMessage } from '../../core/parse';
import { PageState } from '../../core/state/page-state';
import { EnsembleData } from '../../ensembles/ensemble-data';
import { askToConfirm } from '../../core/confirm-dialog/confirm-dialog';
import { localToday } from '../../ladder/date-text';
import { LadderData } from '../../ladder/ladder-data';
import { appliesToFamily, keyText, rungTitleText } from '../../ladder/requirement-text';
import { CellPanel, type NoteChange } from '../cell-panel/cell-panel';
import { entryColumns, studentColumn, type EntryRow } from '../entry-columns';
import { cellKey, cellViewOf, type CellView } from '../entry-cells';
import { EntryDrafts } from '../entry-drafts';
import { PassOffData } from '../pass-off-data';
import { PassOffQueue } from '../pass-off-queue';
import { StudentHistory } from '../student-history/student-history';
import { EntryGrid } from './entry-grid';
import { EnsembleSheet } from './ensemble-sheet';
import { entryEnsembleQuery } from '@shared/api/entry-reads';
import { EntryDeviceCopy, type KeptSetup } from './entry-device-copy';
import { queueBanner } from './entry-sheet';
import { SentTakes } from '../sent-takes';
import { TouchEntry, type TouchCell } from '../touch-entry/touch-entry';

/**
 * When entry is by touch: a coarse pointer (Media Queries Level 4, "pointer") or a window
 * narrower than the grid needs (Material Design 3's compact and medium window classes).
 */
const touchQueries = ['(pointer: coarse)', '(max-width: 839.98px)'];

/**
 * Pass-offs: a director's entry grid, the students of one ensemble against the requirements of
 * one rung, keyboard first and saved as it goes, with each student's history beside it.
 */
import type { SchoolYear } from '@shared/api/school-year';
import { YearPicker } from '../../school-years/year-picker/year-picker';
import { PastPassOffs } from '../past-pass-offs/past-pass-offs';
import { createWrite } from '../../core/state/write';
import { IconButton } from '../../core/icon-button/icon-button';

@Component({
  selector: 'tb-pass-off-entry',
  imports: [
    CellPanel,
    EntryGrid,
    IconButton,
    MatButtonModule,
    MatDialogModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressBarModule,
    MatSelectModule,
    NgTemplateOutlet,
    PageState,
    PastPassOffs,
    RouterLink,
    StudentHistory,
    TouchEntry,
    YearPicker,
  ],
  providers: [EntryDrafts, EnsembleSheet, SentTakes],
  templateUrl: './pass-off-entry.html',
  styleUrl: './pass-off-entry.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PassOffEntry {
  private readonly write = createWrite();
  private readonly ensembleData = inject(EnsembleData);
  protected readonly sheet = inject(EnsembleSheet);
  private readonly ladderData = inject(LadderData);
  private readonly passOffData = inject(PassOffData);
  private readonly router = inject(Router);
  private readonly dialog = inject(MatDialog);
  private readonly destroyRef = inject(DestroyRef);
  protected readonly queue = inject(PassOffQueue);
  protected readonly drafts = inject(EntryDrafts);
  private readonly takes = inject(SentTakes);
  private api: GridApi<EntryRow> | null = null;

  /** The `ensemble` query parameter: the ensemble's id. */
  readonly ensemble = input<string>();
  /** The `rung` query parameter: the rung's number. */
  readonly rung = input<string>();

  protected readonly today = localToday();
  private readonly ensembleList = this.ensembleData.listed(() => entryEnsembleQuery);
  private readonly inForce = this.ladderData.inForce();
  /** The ensembles and the ladder as this device last saw them, until the server answers. */
  private readonly keptSetup = signal<KeptSetup | null>(null);
  /**
   * The ensembles and the ladder together (neither shows before both are read): the server's
   * answers once both are in, until then the copy this device kept of the last visit, if any.
   */
  private readonly setup = computed<{ ensembles: Ensemble[]; ladder: Ladder } | null>(() =>
    this.ensembleList.hasValue() && this.inForce.hasValue()
      ? { ensembles: this.ensembleList.value().rows, ladder: this.inForce.value() }
      : this.keptSetup(),
  );
  protected readonly ensembles = computed(() => this.setup()?.ensembles ?? null);
  protected readonly ladder = computed(() => this.setup()?.ladder ?? null);
  protected readonly setupError = computed(() => {
    const error = this.ensembleList.error() ?? this.inForce.error();
    return error ? errorMessage(error, 'The ensembles and the ladder could not be loaded.') : '';
  });
  protected readonly focused = signal<{ studentId: number; code: string } | null>(null);
  protected readonly historyStudent = signal<number | null>(null);
  protected readonly historyToken = signal(0);
  protected readonly announcement = signal('');
  protected readonly canWrite = inject(CurrentUser).can('pass-offs:write');
  /** A past year chosen in the year picker: its pass-offs, read-only, instead of the entry grid. */
  protected readonly pastYear = signal<SchoolYear | null>(null);
  private readonly breakpoints = inject(BreakpointObserver);
  /** Whether the entry is one student at a time by touch rather than the keyboard grid. */
  protected readonly touch = toSignal(
    this.breakpoints.observe(touchQueries).pipe(map((state) => state.matches)),
    { initialValue: this.breakpoints.isMatched(touchQueries) },
  );
  /** What a student's cell shows, for the touch entry. */
  protected readonly touchCellView = (row: EntryRow, requirement: LadderRequirement) =>
    this.cellView(row, requirement);
  /** The cell side panel as the touch entry opens it: a sheet over the page. */
  private readonly touchPanel = viewChild.required<TemplateRef<unknown>>('touchPanel');
  private touchPanelRef: MatDialogRef<unknown> | null = null;

  protected readonly ensembleId = computed(() => Number(this.ensemble()) || null);
  protected readonly rungNumber = computed(() => Number(this.rung()) || null);
  protected readonly chosenEnsemble = computed(
    () => this.ensembles()?.find((each) => each.id === this.ensembleId()) ?? null,
  );
  protected readonly chosenRung = computed(
    () => this.ladder()?.rungs.find((rung) => rung.number === this.rungNumber()) ?? null,
  );
  protected readonly rungTitle = rungTitleText;
  protected readonly keyText = keyText;
  protected readonly ensembleGroups = computed(() => {
    const groups = new Map<string, Ensemble[]>();
    for (const ensemble of this.ensembles() ?? []) {
      groups.set(ensemble.schoolName, [...(groups.get(ensemble.schoolName) ?? []), ensemble]);
    }
    return [...groups].map(([school, ensembles]) => ({ school, ensembles }));
  });
  /** The rung's requirements that apply to at least one student of the ensemble. */
  protected readonly requirements = computed(() => {
    const families = new Set((this.sheet.rows() ?? []).map((row) => row.family));
    return (this.chosenRung()?.requirements ?? []).filter((requirement) =>
      [...families].some((family) => appliesToFamily(requirement, family)),
    );
  });
  protected readonly columns = computed(() =>
    entryColumns(this.requirements(), (row, requirement) => this.cellView(row, requirement)),
  );
  protected readonly banner = computed(() => queueBanner(this.queue));
  protected readonly failedEntries = computed(() =>
    [...this.queue.entries().values()].filter((entry) => entry.status === 'failed'),
  );
  protected readonly focusedCell = computed(() => {
    const focused = this.focused();
    const row = this.sheet.rows()?.find((each) => each.studentId === focused?.studentId);
    const requirement = this.requirements().find((each) => each.code === focused?.code);
    if (!focused || !row || !requirement || !appliesToFamily(requirement, row.family)) return null;
    const key = cellKey(row.studentId, requirement.code);
    const heard = this.sheet.existing().get(key) ?? [];
    return {
      row,
      requirement,
      draft: this.drafts.drafts().get(key) ?? null,
      entry: this.drafts.entriesByCell().get(key) ?? null,
      heard,
      latest: heard[0] ?? null,
      takes: this.takes.byCell().get(key) ?? [],
      instrumentId: this.sheet.instruments().get(row.studentId) ?? null,
    };
  });
  protected readonly historyRow = computed(
    () => this.sheet.rows()?.find((row) => row.studentId === this.historyStudent()) ?? null,
  );

  constructor() {
    void inject(EntryDeviceCopy)
      .setup()
      .then((kept) => this.keptSetup.set(kept));
    this.queue.start(inject(CurrentUser).me()?.id ?? 0);
    this.drafts.heardOn.set(this.today);
    effect(() => {
      const id = this.ensembleId();
      untracked(() => {
        this.historyStudent.set(null);
        this.drafts.ensembleId.set(id);
        this.sheet.load(id);
      });
    });
    effect(() => {
      this.drafts.drafts();
      this.drafts.entriesByCell();
      this.sheet.existing();
      this.takes.byCell();
      this.api?.refreshCells({ force: true });
    });
    // The queue reports each batch the server saved, for as long as the page is open.
    this.queue.saved.pipe(takeUntilDestroyed()).subscribe((rows) => this.merge(rows));
    const leave = () => this.drafts.commitAll();
    window.addEventListener('pagehide', leave);
    this.destroyRef.onDestroy(() => {
      window.removeEventListener('pagehide', leave);
      this.drafts.commitAll();
    });
  }

  protected choose(ensemble: number | null, rung: number | null): void {
    this.drafts.commitAll();
    this.focused.set(null);
    void this.router.navigate([], {
      queryParams: { ensemble: ensemble ?? undefined, rung: rung ?? undefined },
      replaceUrl: true,
    });
  }

  protected setHeardOn(event: Event): void {
    const value = (event.target as HTMLInputElement).value;
    if (value) this.drafts.heardOn.set(value);
  }

  protected gridReady(event: GridReadyEvent<EntryRow>): void {
    this.api = event.api;
  }

  protected cellFocused(event: CellFocusedEvent<EntryRow>): void {
    const column = event.column;
    const colId = typeof column === 'string' ? column : column?.getColId();
    const row =
      event.rowIndex === null ? undefined : this.api?.getDisplayedRowAtIndex(event.rowIndex)?.data;
    const before = this.focused();
    const next = row && colId ? { studentId: row.studentId, code: colId } : null;
    if (before && (before.studentId !== next?.studentId || before.code !== next?.code)) {
      this.drafts.left(cellKey(before.studentId, before.code));
    }
    this.focused.set(next);
    if (
      next &&
      colId !== studentColumn &&
      this.historyStudent() !== null &&
      this.requirements().some((each) => each.code === colId)
    ) {
      this.historyStudent.set(null);
    }
  }

  /**
   * Opens the cell side panel for a scale of the touch entry: on a phone a full-screen sheet (the
   * app's dialogs are on a compact window), on a tablet a side sheet at the window's end edge
   * (Material Design 3, "Side sheets").
   */
  protected openTouchCell(cell: TouchCell): void {
    this.focused.set(cell);
    const ref = this.dialog.open(this.touchPanel(), {
      ariaLabelledBy: 'cell-panel-title',
      width: '440px',
      maxWidth: '100vw',
      height: '100%',
      maxHeight: '100%',
      position: { right: '0', top: '0' },
      panelClass: 'tb-side-sheet',
    });
    this.touchPanelRef = ref;
    // The side sheet's closing is an event for later; the grid goes on meanwhile.
    ref.afterClosed().subscribe(() => {
      if (this.touchPanelRef === ref) this.touchPanelRef = null;
      // Whatever was written into the note goes out as leaving a grid cell would send it.
      this.drafts.hold(false);
      this.drafts.left(cellKey(cell.studentId, cell.code));
      this.focused.set(null);
    });
  }

  protected closeTouchPanel(): void {
    this.touchPanelRef?.close();
  }

  /** The panel's history button on a touch screen: the history replaces the entry. */
  protected touchHistory(studentId: number): void {
    this.closeTouchPanel();
    this.historyStudent.set(studentId);
  }

  /** A take's tempo chosen in the touch panel: back to the scale's card to tap the result. */
  protected touchTakeTempo(tempo: number): void {
    this.prefillFromTake(tempo);
    this.closeTouchPanel();
  }

  protected cellClicked(event: CellClickedEvent<EntryRow>): void {
    if (event.column.getColId() === studentColumn && event.data)
      this.historyStudent.set(event.data.studentId);
  }

  protected cellKeyDown(
    event: CellKeyDownEvent<EntryRow> | FullWidthCellKeyDownEvent<EntryRow>,
  ): void {
    const keyboard = event.event as KeyboardEvent | null | undefined;
    if (
      !keyboard ||
      keyboard.ctrlKey ||
      keyboard.metaKey ||
      keyboard.altKey ||
      !event.data ||
      !('column' in event)
    )
      return;
    const row = event.data;
    const colId = event.column.getColId();
    if (colId === studentColumn && keyboard.key === 'Enter') {
      this.historyStudent.set(row.studentId);
      return;
    }
    const requirement = this.requirements().find((each) => each.code === colId);
    if (!requirement || !this.canWrite) return;
    if (!appliesToFamily(requirement, row.family)) {
      if (/^[pPnN0-9]$|^Enter$/.test(keyboard.key))
        this.announce(
          `${keyText(requirement)} is not asked of ${row.instrumentName || 'this student'}.`,
        );
      return;
    }
    const result = this.drafts.keystroke({ studentId: row.studentId, requirement }, keyboard.key);
    if (!result.handled) return;
    keyboard.preventDefault();
    if (result.announce) this.announce(result.announce);
  }

  protected noteInput(note: string): void {
    const cell = this.focusedCell();
    if (cell)
      this.drafts.setNote({ studentId: cell.row.studentId, requirement: cell.requirement }, note);
  }

  protected saveNote({ passOff, note }: NoteChange): void {
    this.write.send(this.passOffData.update(passOff.id, { note, version: passOff.version }), {
      next: (updated) => {
        this.merge([updated]);
        this.announce('Note saved.');
      },
      error: (error: unknown) => this.announce(errorMessage(error, 'The note could not be saved.')),
    });
  }

  protected async removePassOff(passOff: PassOff): Promise<void> {
    const confirmed = await askToConfirm(this.dialog, {
      title: 'Remove this pass-off?',
      paragraphs: [
        `${passOff.studentName}, heard on ${passOff.heardOn} at ♩ = ${passOff.tempo}. Their rung is recomputed without it.`,
      ],
      confirm: 'Remove the pass-off',
      destructive: true,
    });
    if (!confirmed) return;
    this.write.send(this.passOffData.remove(passOff.id), {
      next: () => {
        this.sheet.removed(passOff);
        if (passOff.clientKey) this.queue.forget(passOff.clientKey);
        this.announce('Pass-off removed.');
      },
      error: (error: unknown) =>
        this.announce(errorMessage(error, 'The pass-off could not be removed.')),
    });
  }

  private cellView(
    row: EntryRow,
    requirement: LadderRequirement,
  ): CellView & { takeSent?: boolean } {
    const view = cellViewOf(row, requirement, {
      drafts: this.drafts.drafts(),
      entries: this.drafts.entriesByCell(),
      heard: this.sheet.existing(),
      ladderId: this.ladder()?.id,
    });
    const takeSent = this.takes.byCell().has(cellKey(row.studentId, requirement.code));
    return takeSent ? { ...view, takeSent } : view;
  }

  /** Fills the focused cell's tempo with the tempo heard in a take. */
  protected prefillFromTake(tempo: number): void {
    const cell = this.focusedCell();
    if (!cell) return;
    this.drafts.prefillTempo(
      { studentId: cell.row.studentId, requirement: cell.requirement },
      tempo,
    );
    this.announce(
      `Tempo ${Math.round(tempo)} filled in from the take. Press P if it passed, N if not yet.`,
    );
  }

  private merge(saved: readonly PassOff[]): void {
    const students = this.sheet.merge(saved);
    const history = this.historyStudent();
    if (history !== null && students.has(history)) this.historyToken.update((token) => token + 1);
  }

  protected announce(message: string): void {
    this.announcement.set('');
    queueMicrotask(() => this.announcement.set(message));
  }
}
