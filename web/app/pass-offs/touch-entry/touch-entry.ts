import {
  ChangeDetectionStrategy,
  Component,
  afterNextRender,
  computed,
  inject,
  input,
  linkedSignal,
  output,
  signal,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import type { LadderRequirement } from '@shared/api/ladder';
import { appliesToFamily, keyText, patternText, tempoText } from '../../ladder/requirement-text';
import { cellKey, type CellView } from '../entry-cells';
import type { EntryRow } from '../entry-columns';
import { EntryDrafts, type EntryTarget } from '../entry-drafts';
import { PassOffQueue, type EntryStatus } from '../pass-off-queue';
import { tempoPresets } from './tempo-presets';

/** One scale of the rung as the touch entry shows it for the student in hand. */
interface ScaleCard {
  requirement: LadderRequirement;
  asked: boolean;
  view: CellView;
  /** The tempo an entry would record now: the one chosen, else the requirement's. */
  tempo: number;
  /** What the card's state line says. */
  state: string;
  tone: 'none' | 'draft' | EntryStatus | 'heard';
  /** Whether the student sent a take of this scale. */
  takeSent: boolean;
}

/** A cell of the touch entry: the student in hand and one requirement of the rung. */
export interface TouchCell {
  studentId: number;
  code: string;
}

const statusWords: Record<EntryStatus, string> = {
  waiting: 'Waiting to send',
  saving: 'Sending…',
  saved: 'Saved',
  failed: 'Not accepted',
};

/** A horizontal swipe: at least this far sideways, and mostly sideways (common practice, no source). */
const swipeDistance = 60;

/**
 * Pass-off entry by touch, for a phone or tablet at the music stand: one student at a time,
 * each of the rung's scales with one-tap Passed / Not yet and a tempo heard (presets from the
 * requirement, or a number pad), and a button or a swipe to the next student. Entries go through
 * the same drafts and queue as the keyboard grid, so each keeps its idempotency key.
 */
@Component({
  selector: 'tb-touch-entry',
  imports: [MatButtonModule, MatIconModule],
  templateUrl: './touch-entry.html',
  styleUrl: './touch-entry.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: {
    '(touchstart)': 'touchStart($event)',
    '(touchend)': 'touchEnd($event)',
  },
})
export class TouchEntry {
  private readonly drafts = inject(EntryDrafts);
  protected readonly queue = inject(PassOffQueue);

  /** The ensemble's students, in score order. */
  readonly rows = input.required<readonly EntryRow[]>();
  /** The rung's requirements asked of at least one of them. */
  readonly requirements = input.required<readonly LadderRequirement[]>();
  /** What the grid would show in a student's cell for a requirement. */
  readonly cellView =
    input.required<
      (row: EntryRow, requirement: LadderRequirement) => CellView & { takeSent?: boolean }
    >();
  /** Whether the user may record pass-offs. */
  readonly canWrite = input(true);
  /** Emits a sentence for the screen reader's live region. */
  readonly announce = output<string>();
  /** Emits the student whose history was asked for. */
  readonly openHistory = output<number>();
  /** Emits the cell whose note, takes and past pass-offs were asked for. */
  readonly openCell = output<TouchCell>();

  /**
   * The student shown: the same student when the rows are read again (the server's answer after
   * the device's copy, a rung refresh), so the card under the director's finger stays theirs.
   */
  protected readonly index = linkedSignal<readonly EntryRow[], number>({
    source: this.rows,
    computation: (rows, previous) => {
      const shown = previous ? previous.source[previous.value]?.studentId : undefined;
      const same = rows.findIndex((row) => row.studentId === shown);
      if (same >= 0) return same;
      return Math.min(previous?.value ?? 0, Math.max(rows.length - 1, 0));
    },
  });
  protected readonly student = computed(() => this.rows()[this.index()] ?? null);
  /** The requirement whose number pad is open, if any. */
  protected readonly padFor = signal<string | null>(null);
  protected readonly padDigits = signal('');
  protected readonly keyText = keyText;
  protected readonly patternText = patternText;
  protected readonly tempoText = tempoText;
  protected readonly presets = tempoPresets;
  protected readonly digits = ['1', '2', '3', '4', '5', '6', '7', '8', '9'];

  protected readonly cards = computed((): ScaleCard[] => {
    const row = this.student();
    if (!row) return [];
    const drafts = this.drafts.drafts();
    const view = this.cellView();
    return this.requirements().map((requirement) => {
      const asked = appliesToFamily(requirement, row.family);
      const cell = view(row, requirement);
      const draft = drafts.get(cellKey(row.studentId, requirement.code));
      // The tempo chosen for the next tap: the one picked, else the one of the entry just made
      // (so a second tap records what the first did), else the requirement's.
      const tempo =
        draft && draft.typedTempo !== ''
          ? Number(draft.typedTempo)
          : cell.kind === 'entry'
            ? cell.tempo
            : requirement.tempo;
      const takeSent = cell.takeSent === true;
      return { requirement, asked, view: cell, tempo, takeSent, ...this.stateOf(cell) };
    });
  });

  /**
   * How many of the cards are created: the first alone on the component's first render, so the
   * screen's first frame waits for one card rather than the whole rung; all of them from the
   * task after that frame (see the constructor).
   */
  private readonly cardCount = signal(1);
  protected readonly shownCards = computed(() => this.cards().slice(0, this.cardCount()));

  constructor() {
    // A task queued from a requestAnimationFrame callback runs after that frame is rendered
    // (HTML Living Standard, "update the rendering"), so the first card is painted first.
    afterNextRender(() =>
      requestAnimationFrame(() => setTimeout(() => this.cardCount.set(Infinity))),
    );
  }

  /** What is left to send across the whole queue, always in view. */
  protected readonly queueLine = computed(() => {
    const pending = this.queue.pending();
    if (this.queue.offline())
      return pending
        ? `Offline · ${pending} waiting to send`
        : 'Offline · entries are kept on this device';
    if (pending) return `${pending} waiting to send`;
    return 'All entries saved';
  });

  protected move(step: number): void {
    const next = this.index() + step;
    if (next < 0 || next >= this.rows().length) return;
    this.drafts.commitAll();
    this.padFor.set(null);
    this.index.set(next);
    const student = this.student();
    if (student) this.announce.emit(`${student.name}, ${next + 1} of ${this.rows().length}`);
  }

  protected choose(event: Event): void {
    const value = Number((event.target as HTMLSelectElement).value);
    this.drafts.commitAll();
    this.padFor.set(null);
    this.index.set(value);
  }

  /** Records the result heard for one scale: queued at once, with the tempo chosen. */
  protected mark(card: ScaleCard, passed: boolean): void {
    const target = this.target(card);
    if (!target) return;
    const key = cellKey(target.studentId, card.requirement.code);
    if (!this.drafts.drafts().get(key)?.typedTempo && card.tempo !== card.requirement.tempo)
      this.drafts.prefillTempo(target, card.tempo);
    this.drafts.keystroke(target, passed ? 'P' : 'N');
    this.drafts.commit(key);
    this.padFor.set(null);
    this.announce.emit(
      `${keyText(card.requirement)}: ${passed ? 'passed' : 'not yet'} at ${card.tempo}.`,
    );
  }

  /** Opens the scale's note, the student's sent takes and the director's own take. */
  protected details(card: ScaleCard): void {
    const row = this.student();
    if (!row || !card.asked) return;
    this.padFor.set(null);
    this.openCell.emit({ studentId: row.studentId, code: card.requirement.code });
  }

  protected setTempo(card: ScaleCard, tempo: number): void {
    const target = this.target(card);
    if (!target) return;
    this.drafts.prefillTempo(target, tempo);
    this.announce.emit(`Tempo ${tempo}. Tap Passed or Not yet.`);
  }

  protected togglePad(card: ScaleCard): void {
    const open = this.padFor() === card.requirement.code;
    this.padFor.set(open ? null : card.requirement.code);
    this.padDigits.set('');
  }

  protected padKey(card: ScaleCard, key: string): void {
    if (key === 'clear') {
      this.padDigits.set('');
      return;
    }
    if (key === 'done') {
      const tempo = Number(this.padDigits());
      if (tempo >= 20 && tempo <= 300) {
        this.setTempo(card, tempo);
        this.padFor.set(null);
      } else {
        this.announce.emit('A tempo is between 20 and 300.');
      }
      return;
    }
    this.padDigits.update((typed) => (typed.length < 3 ? typed + key : typed));
  }

  private touchX = 0;
  private touchY = 0;

  protected touchStart(event: TouchEvent): void {
    const touch = event.changedTouches[0];
    if (!touch) return;
    this.touchX = touch.clientX;
    this.touchY = touch.clientY;
  }

  protected touchEnd(event: TouchEvent): void {
    const touch = event.changedTouches[0];
    if (!touch) return;
    const across = touch.clientX - this.touchX;
    const down = touch.clientY - this.touchY;
    if (Math.abs(across) >= swipeDistance && Math.abs(across) > 2 * Math.abs(down))
      this.move(across < 0 ? 1 : -1);
  }

  private target(card: ScaleCard): EntryTarget | null {
    const row = this.student();
    if (!row || !card.asked || !this.canWrite()) return null;
    return { studentId: row.studentId, requirement: card.requirement };
  }

  private stateOf(view: CellView): Pick<ScaleCard, 'state' | 'tone'> {
    switch (view.kind) {
      case 'not-asked':
        return { state: 'Not asked of this instrument', tone: 'none' };
      case 'empty':
        return { state: 'Not heard yet', tone: 'none' };
      case 'draft':
        return {
          state: view.problem || `♩ = ${view.tempo} chosen · tap Passed or Not yet`,
          tone: 'draft',
        };
      case 'entry':
        return {
          state: `${view.passed ? 'Passed' : 'Not yet'} at ♩ = ${view.tempo} · ${statusWords[view.status]}${view.status === 'failed' && view.message ? `: ${view.message}` : ''}`,
          tone: view.status,
        };
      case 'heard':
        return {
          state: `On record: ${view.passOff.passed ? 'passed' : 'not yet'} at ♩ = ${view.passOff.tempo}, ${view.passOff.heardOn}${view.passOff.standing === 'counts' || view.passOff.standing === 'not-yet' ? '' : ' (does not count)'}`,
          tone: 'heard',
        };
    }
  }
}
