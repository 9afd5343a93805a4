import { Injectable, inject } from '@angular/core';
import type { AttainmentRow } from '@shared/api/analytics';
import { ensembleDetailSchema, type Ensemble, type EnsembleMember } from '@shared/api/ensemble';
import { ladderSchema, type Ladder } from '@shared/api/ladder';
import { passOffSchema, type PassOff } from '@shared/api/pass-off';
import { LastVisit } from '../../core/offline/last-visit';
import { readKey } from '../../core/state/early-reads';
import { ensembleListSchema } from '../../ensembles/ensemble-data';
import { attainmentListSchema, passOffListSchema } from '../pass-off-data';
import { entryReads, pagesAfter } from '@shared/api/entry-reads';

/** An ensemble's sheet as this device last saw it. */
export interface KeptSheet {
  members: EnsembleMember[];
  passOffs: PassOff[];
  rungs: AttainmentRow[];
}

/** The ensembles and the ladder in force as this device last saw them. */
export interface KeptSetup {
  ensembles: Ensemble[];
  ladder: Ladder;
}

/** Where the pass-offs saved since the ensemble's last full read are kept, per ensemble. */
const savedSinceKey = (ensembleId: number) => `pass-offs saved since the last read ${ensembleId}`;

/**
 * The entry screen's reads as this device kept them from the last visit (the answers the
 * offline mode keeps), for the screen to paint before the server answers. Only the copy of the
 * user the session names is read (`LastVisit.keptForSession`); the server's answers follow and
 * replace it. A copy that no longer matches the shared schemas is not painted.
 */
@Injectable({ providedIn: 'root' })
export class EntryDeviceCopy {
  private readonly lastVisit = inject(LastVisit);
  private writes: Promise<void> = Promise.resolve();
  /** Reads started as the route matched, each taken once by the screen. */
  private started: {
    setup?: Promise<KeptSetup | null>;
    sheets: Map<number, Promise<KeptSheet | null>>;
  } = { sheets: new Map() };

  /**
   * Starts reading the copy as the route is matched (`startEntryReads`), so the device's reads
   * and their checks overlap the screen's code loading instead of following it.
   */
  start(ensembleId: number | null): void {
    this.started = { setup: this.readSetup(), sheets: new Map() };
    if (ensembleId) this.started.sheets.set(ensembleId, this.readSheet(ensembleId));
  }

  /** The ensembles and the ladder in force as last seen, or null when the device has none. */
  setup(): Promise<KeptSetup | null> {
    const started = this.started.setup;
    this.started.setup = undefined;
    return started ?? this.readSetup();
  }

  /** The ensemble's seats, pass-offs (with those saved since) and rungs as last seen, or null. */
  sheet(ensembleId: number): Promise<KeptSheet | null> {
    const started = this.started.sheets.get(ensembleId);
    this.started.sheets.delete(ensembleId);
    return started ?? this.readSheet(ensembleId);
  }

  private async readSetup(): Promise<KeptSetup | null> {
    const [ensembleRead, ladderRead] = entryReads(null);
    const [ensembles, ladder] = await this.lastVisit.keptForSession([
      readKey(ensembleRead!),
      readKey(ladderRead!),
    ]);
    const list = ensembleListSchema.safeParse(ensembles);
    const inForce = ladderSchema.safeParse(ladder);
    return list.success && inForce.success
      ? { ensembles: list.data.rows, ladder: inForce.data }
      : null;
  }

  private async readSheet(ensembleId: number): Promise<KeptSheet | null> {
    const [, , detailRead, firstPageRead, rungsRead] = entryReads(ensembleId);
    // The pages after the first as many as the first's total says; read together, checked after.
    const [detailBody, firstBody, rungsBody, savedBody] = await this.lastVisit.keptForSession([
      readKey(detailRead!),
      readKey(firstPageRead!),
      readKey(rungsRead!),
      savedSinceKey(ensembleId),
    ]);
    const later = pagesAfter(firstPageRead!, firstBody);
    const laterBodies = later.length
      ? await this.lastVisit.keptForSession(later.map((read) => readKey(read)))
      : [];
    const detail = ensembleDetailSchema.safeParse(detailBody);
    const rungs = attainmentListSchema.safeParse(rungsBody);
    const pages = [firstBody, ...laterBodies].map((body) => passOffListSchema.safeParse(body));
    if (!detail.success || !rungs.success || pages.some((page) => !page.success)) return null;
    const savedSince = passOffSchema.array().safeParse(savedBody ?? []);
    return {
      members: detail.data.members,
      passOffs: pages
        .flatMap((page) => (page.success ? page.data.rows : []))
        .concat(savedSince.success ? savedSince.data : []),
      rungs: rungs.data.rows,
    };
  }

  /**
   * Keeps pass-offs the server saved while the screen is open, so the next visit's first paint
   * shows them before the ensemble is read again (the reads' own copies are as of the last read).
   */
  noteSaved(ensembleId: number, saved: readonly PassOff[]): Promise<void> {
    // One after another, so two saves in quick succession both stay.
    this.writes = this.writes.then(async () => {
      const before = passOffSchema
        .array()
        .safeParse((await this.lastVisit.keptForSession([savedSinceKey(ensembleId)]))[0] ?? []);
      const byId = new Map((before.success ? before.data : []).map((each) => [each.id, each]));
      for (const passOff of saved) byId.set(passOff.id, passOff);
      await this.lastVisit.keep(savedSinceKey(ensembleId), [...byId.values()]);
    });
    return this.writes;
  }

  /** Forgets the pass-offs saved since the last read: the server's full answer holds them now. */
  readAgain(ensembleId: number): Promise<void> {
    this.writes = this.writes.then(() => this.lastVisit.keep(savedSinceKey(ensembleId), []));
    return this.writes;
  }
}
