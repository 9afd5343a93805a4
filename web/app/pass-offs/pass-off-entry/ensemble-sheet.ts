import { Injectable, computed, inject, signal } from '@angular/core';
import { forkJoin } from 'rxjs';
import type { EnsembleMember } from '@shared/api/ensemble';
import type { PassOff } from '@shared/api/pass-off';
import { errorMessage } from '../../core/parse';
import { EnsembleData } from '../../ensembles/ensemble-data';
import type { EntryRow } from '../entry-columns';
import { cellKey } from '../entry-cells';
import { PassOffData } from '../pass-off-data';
import { EntryDeviceCopy } from './entry-device-copy';
import { membersToRows, passOffsByCell } from './entry-sheet';

/** How long after a save the rung column is read again, so a burst of saves costs one read. */
const rungRefreshPause = 800;

/**
 * What the entry grid shows of one ensemble: its students, their instruments and rungs, and
 * their pass-offs on record by cell, kept up to date as entries are saved.
 */
@Injectable()
export class EnsembleSheet {
  private readonly ensembleData = inject(EnsembleData);
  private readonly passOffData = inject(PassOffData);
  private readonly deviceCopy = inject(EntryDeviceCopy);
  private ensembleId: number | null = null;
  private rungRefresh: ReturnType<typeof setTimeout> | undefined;
  private readonly rungs = signal<ReadonlyMap<number, number>>(new Map());
  private readonly rungsLoaded = signal(false);

  /** The students down the side, in score order; null while loading. */
  readonly rows = signal<EntryRow[] | null>(null);
  /** Each student's instrument id, for practice-sheet links. */
  readonly instruments = signal<ReadonlyMap<number, string | null>>(new Map());
  /** Pass-offs on record by cell, newest first. */
  readonly existing = signal<ReadonlyMap<string, PassOff[]>>(new Map());
  readonly error = signal('');
  /** The rows with their current rung. */
  readonly gridRows = computed(() =>
    (this.rows() ?? []).map((row) => ({
      ...row,
      rung: this.rungs().get(row.studentId) ?? null,
      rungLoading: !this.rungsLoaded(),
    })),
  );
  readonly heardCount = computed(() =>
    [...this.existing().values()].reduce((sum, list) => sum + list.length, 0),
  );

  /**
   * Loads an ensemble's students and every pass-off they have (or clears the sheet): painted
   * first from this device's copy of the last visit when it holds one, then from the server's
   * answer, which replaces it (and is never replaced by the copy arriving late).
   */
  load(ensembleId: number | null): void {
    this.ensembleId = ensembleId;
    this.rows.set(null);
    this.existing.set(new Map());
    this.rungs.set(new Map());
    this.rungsLoaded.set(false);
    this.error.set('');
    if (!ensembleId) return;
    let answered = false;
    this.deviceCopy.sheet(ensembleId).then(
      (kept) => {
        if (!kept || answered || this.ensembleId !== ensembleId) return;
        this.show(kept.members, kept.passOffs);
        this.rungs.set(new Map(kept.rungs.map((row) => [row.id, row.rung])));
        this.rungsLoaded.set(true);
      },
      () => undefined,
    );
    // Read on command for the chosen ensemble; an answer for one no longer chosen is dropped.
    forkJoin([this.ensembleData.get(ensembleId), this.passOffData.all({ ensembleId })]).subscribe({
      next: ([detail, passOffs]) => {
        answered = true;
        if (this.ensembleId !== ensembleId) return;
        this.show(detail.members, passOffs);
        void this.deviceCopy.readAgain(ensembleId);
        this.refreshRungs(ensembleId);
      },
      error: (error: unknown) => {
        answered = true;
        if (this.ensembleId !== ensembleId) return;
        // The server refused or failed: nothing painted from the device stays.
        this.rows.set(null);
        this.existing.set(new Map());
        this.error.set(errorMessage(error, 'The ensemble could not be loaded.'));
      },
    });
  }

  private show(members: readonly EnsembleMember[], passOffs: readonly PassOff[]): void {
    const { rows, instruments } = membersToRows(members);
    this.instruments.set(instruments);
    this.existing.set(passOffsByCell(passOffs));
    this.rows.set(rows);
  }

  /** Takes in pass-offs as the server recorded them; answers the students they belong to. */
  merge(saved: readonly PassOff[]): Set<number> {
    const byId = new Map(
      [...this.existing().values()].flat().map((passOff) => [passOff.id, passOff]),
    );
    for (const passOff of saved) byId.set(passOff.id, passOff);
    this.existing.set(passOffsByCell([...byId.values()]));
    const students = new Set(saved.map((passOff) => passOff.studentId));
    const seated = new Set((this.rows() ?? []).map((row) => row.studentId));
    const ours = saved.filter((passOff) => seated.has(passOff.studentId));
    if (this.ensembleId && ours.length) void this.deviceCopy.noteSaved(this.ensembleId, ours);
    if (this.rows()?.some((row) => students.has(row.studentId))) this.refreshRungsSoon();
    return students;
  }

  /** Drops a pass-off the server removed. */
  removed(passOff: PassOff): void {
    this.existing.update((existing) => {
      const next = new Map(existing);
      const key = cellKey(passOff.studentId, passOff.requirementCode);
      next.set(
        key,
        (next.get(key) ?? []).filter((each) => each.id !== passOff.id),
      );
      return next;
    });
    this.refreshRungsSoon();
  }

  private refreshRungsSoon(): void {
    clearTimeout(this.rungRefresh);
    this.rungRefresh = setTimeout(() => {
      if (this.ensembleId) this.refreshRungs(this.ensembleId);
    }, rungRefreshPause);
  }

  private refreshRungs(ensembleId: number): void {
    // Read again a pause after each save; an answer for an ensemble no longer chosen is dropped.
    this.passOffData.rungsOfEnsemble(ensembleId).subscribe({
      next: (rows) => {
        if (this.ensembleId !== ensembleId) return;
        this.rungs.set(new Map(rows.map((row) => [row.id, row.rung])));
        this.rungsLoaded.set(true);
      },
      // Offline, the rung column keeps what it showed; the next save brings it up to date.
      error: () => undefined,
    });
  }
}
