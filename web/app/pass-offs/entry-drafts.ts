import { Injectable, computed, inject, signal } from '@angular/core';
import type { LadderRequirement } from '@shared/api/ladder';
import { passOffInputSchema } from '@shared/api/pass-off';
import { cellKey, draftTempo, type CellDraft } from './entry-cells';
import { PassOffQueue, type EnteredPassOff, type QueueEntry } from './pass-off-queue';

/** How long a cell may sit untouched before what was typed into it is sent. */
const idlePause = 1500;

/**
 * A random (version 4) UUID. `crypto.randomUUID` exists only on secure pages; a district server
 * reached over plain http on its own network still has `getRandomValues` (RFC 9562, section 5.4).
 */
export function newClientKey(): string {
  if (typeof crypto.randomUUID === 'function') return crypto.randomUUID();
  const bytes = crypto.getRandomValues(new Uint8Array(16));
  bytes[6] = (bytes[6]! & 0x0f) | 0x40;
  bytes[8] = (bytes[8]! & 0x3f) | 0x80;
  const hex = [...bytes].map((byte) => byte.toString(16).padStart(2, '0')).join('');
  return `${hex.slice(0, 8)}-${hex.slice(8, 12)}-${hex.slice(12, 16)}-${hex.slice(16, 20)}-${hex.slice(20)}`;
}

/** The cell a keystroke lands on. */
export interface EntryTarget {
  studentId: number;
  requirement: LadderRequirement;
}

/** What a keystroke did, for the screen reader's live region. */
export type KeystrokeResult = { handled: boolean; announce?: string };

/**
 * The keyboard side of the entry grid: what is being typed into each cell (P or Enter for
 * passed, N for not yet, digits for the tempo heard, Backspace or Delete to clear), and when it
 * becomes an entry of the queue — on leaving the cell, or after a short pause.
 */
@Injectable()
export class EntryDrafts {
  private readonly queue = inject(PassOffQueue);
  private readonly state = signal<ReadonlyMap<string, CellDraft>>(new Map());
  private readonly targets = new Map<string, EntryTarget>();
  private idleTimer: ReturnType<typeof setTimeout> | undefined;
  private lastDigitCell: string | null = null;
  private holding = false;

  /** The day new entries were heard on (YYYY-MM-DD). */
  readonly heardOn = signal('');
  /** The ensemble being heard, sent with each entry so the server can refuse an unseated student. */
  readonly ensembleId = signal<number | null>(null);
  /** What is being typed, by cell. */
  readonly drafts = this.state.asReadonly();
  /** The queue's latest entry for each cell (restored ones included). */
  readonly entriesByCell = computed(() => {
    const byCell = new Map<string, QueueEntry>();
    for (const entry of this.queue.entries().values()) {
      byCell.set(cellKey(entry.passOff.studentId, entry.passOff.requirementCode), entry);
    }
    return byCell;
  });

  /** Handles one key pressed on a requirement cell. */
  keystroke(target: EntryTarget, key: string): KeystrokeResult {
    const id = cellKey(target.studentId, target.requirement.code);
    const digit = /^[0-9]$/.test(key);
    if (key === 'p' || key === 'P' || key === 'Enter' || key === 'n' || key === 'N') {
      const passed = key.toLowerCase() !== 'n';
      this.edit(target, (draft) => ({ ...draft, passed, problem: '' }));
      this.lastDigitCell = null;
      return { handled: true, announce: passed ? 'Passed' : 'Not yet' };
    }
    if (digit) {
      const appending = this.lastDigitCell === id;
      this.edit(target, (draft) => {
        const typed = appending && draft.typedTempo.length < 3 ? draft.typedTempo + key : key;
        return { ...draft, typedTempo: typed, problem: '' };
      });
      this.lastDigitCell = id;
      return { handled: true };
    }
    if (key === 'Backspace' || key === 'Delete') {
      this.lastDigitCell = null;
      return this.clear(id);
    }
    return { handled: false };
  }

  /** Changes the note of the cell's draft (starting one from a waiting entry if need be). */
  /**
   * Fills a cell's tempo with the tempo heard in a take; whether it passed is left to the
   * director's P or N.
   */
  prefillTempo(target: EntryTarget, tempo: number): void {
    this.edit(target, (draft) => ({
      ...draft,
      typedTempo: String(Math.round(tempo)),
      problem: '',
    }));
    this.lastDigitCell = null;
  }

  setNote(target: EntryTarget, note: string): void {
    this.edit(target, (draft) => ({ ...draft, note }));
  }

  /** Keeps drafts from being sent while the note field has focus. */
  hold(holding: boolean): void {
    this.holding = holding;
    if (!holding) this.restartIdle();
  }

  /** Sends the cell's draft when it is complete (a result and a valid tempo). */
  commit(id: string): void {
    const draft = this.state().get(id);
    const target = this.targets.get(id);
    if (!draft || !target || draft.passed === null) return;
    const passOff: EnteredPassOff = {
      clientKey: draft.clientKey,
      studentId: target.studentId,
      requirementCode: target.requirement.code,
      heardOn: this.heardOn(),
      tempo: draftTempo(draft, target.requirement),
      passed: draft.passed,
      note: draft.note.trim(),
      ...(this.ensembleId() ? { ensembleId: this.ensembleId()! } : {}),
      enteredAt: new Date().toISOString(),
    };
    const checked = passOffInputSchema.safeParse(passOff);
    if (!checked.success) {
      const problem = checked.error.issues[0]?.message ?? 'Check this entry.';
      this.state.update((drafts) => new Map(drafts).set(id, { ...draft, problem }));
      return;
    }
    this.queue.enqueue(passOff);
    this.state.update((drafts) => {
      const next = new Map(drafts);
      next.delete(id);
      return next;
    });
  }

  /** Sends every complete draft. */
  commitAll(): void {
    for (const id of [...this.state().keys()]) this.commit(id);
  }

  /** Leaving a cell sends what was typed into it. */
  left(id: string | null): void {
    this.lastDigitCell = null;
    if (id) this.commit(id);
  }

  private clear(id: string): KeystrokeResult {
    if (this.state().has(id)) {
      this.state.update((drafts) => {
        const next = new Map(drafts);
        next.delete(id);
        return next;
      });
      return { handled: true, announce: 'Entry cleared' };
    }
    const entry = this.entriesByCell().get(id);
    if (entry && this.queue.discard(entry.passOff.clientKey))
      return { handled: true, announce: 'Entry cleared' };
    if (entry?.status === 'saving')
      return { handled: true, announce: 'This entry is already on its way to the server.' };
    if (entry?.status === 'saved') {
      return {
        handled: true,
        announce: 'This pass-off is saved. To take it back, use Remove in the side panel.',
      };
    }
    return { handled: true };
  }

  private edit(target: EntryTarget, change: (draft: CellDraft) => CellDraft): void {
    const id = cellKey(target.studentId, target.requirement.code);
    this.targets.set(id, target);
    const draft = this.state().get(id) ?? this.reopened(id, target) ?? this.fresh();
    this.state.update((drafts) => new Map(drafts).set(id, change(draft)));
    this.restartIdle();
  }

  /** A waiting or refused entry of the cell taken back from the queue, keeping its client key. */
  private reopened(id: string, target: EntryTarget): CellDraft | null {
    const entry = this.entriesByCell().get(id);
    if (!entry || (entry.status !== 'waiting' && entry.status !== 'failed')) return null;
    const passOff =
      entry.status === 'waiting' ? this.queue.take(entry.passOff.clientKey) : entry.passOff;
    if (!passOff) return null;
    if (entry.status === 'failed') this.queue.discard(passOff.clientKey);
    return {
      clientKey: passOff.clientKey,
      passed: passOff.passed,
      typedTempo: passOff.tempo === target.requirement.tempo ? '' : String(passOff.tempo),
      note: passOff.note,
      problem: '',
    };
  }

  private fresh(): CellDraft {
    return { clientKey: newClientKey(), passed: null, typedTempo: '', note: '', problem: '' };
  }

  private restartIdle(): void {
    clearTimeout(this.idleTimer);
    this.idleTimer = setTimeout(() => {
      if (!this.holding) this.commitAll();
    }, idlePause);
  }
}
