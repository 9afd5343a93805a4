import {
  ChangeDetectionStrategy,
  Component,
  computed,
  input,
  linkedSignal,
  output,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { RouterLink } from '@angular/router';
import type { LadderRequirement } from '@shared/api/ladder';
import type { PassOff } from '@shared/api/pass-off';
import type { Take } from '@shared/api/take';
import { aidSuggestion, verdictLabels } from '../../practice/take-panel/take-analysis-view';
import { DirectorTake } from './director-take';
import { dateText } from '../../ladder/date-text';
import {
  articulationText,
  familiesText,
  keyText,
  patternText,
  practiceQuery,
  tempoText,
} from '../../ladder/requirement-text';
import type { EntryRow } from '../entry-columns';
import type { CellDraft } from '../entry-cells';
import type { QueueEntry } from '../pass-off-queue';

/** A note to save on a recorded pass-off. */
export interface NoteChange {
  passOff: PassOff;
  note: string;
}

/**
 * The side panel of the entry grid for the focused cell: the requirement in full with its
 * practice sheet, the note of the entry being made, and what was heard before in that cell.
 */
@Component({
  selector: 'tb-cell-panel',
  imports: [
    DirectorTake,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    RouterLink,
  ],
  templateUrl: './cell-panel.html',
  styleUrl: './cell-panel.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CellPanel {
  readonly row = input.required<EntryRow>();
  readonly requirement = input.required<LadderRequirement>();
  readonly instrumentId = input<string | null>(null);
  readonly draft = input<CellDraft | null>(null);
  readonly entry = input<QueueEntry | null>(null);
  /** The cell's pass-offs on record, newest first. */
  readonly heard = input<readonly PassOff[]>([]);
  /** The cell's newest pass-off on record, whose note can still be changed. */
  readonly latest = input<PassOff | null>(null);
  readonly activeVersionId = input<number | null>(null);
  readonly canRemove = input(false);
  /** Takes the student sent of this requirement, newest first. */
  readonly takes = input<readonly Take[]>([]);
  /**
   * Whether the panel serves the touch entry, where a result is one tap on the scale's card: a
   * note can then be written before that tap, and goes out with the entry.
   */
  readonly touch = input(false);

  readonly noteInput = output<string>();
  readonly noteFocus = output<boolean>();
  readonly noteSave = output<NoteChange>();
  readonly removePassOff = output<PassOff>();
  readonly openHistory = output<number>();
  /** Fill the cell's tempo with the tempo heard in a take. */
  readonly useTakeTempo = output<number>();

  protected readonly verdictLabels = verdictLabels;

  protected suggestion(take: Take): string {
    return aidSuggestion(take.analysis, take.tempoAsked);
  }

  /** A tempo or a number of cents, whole. */
  protected wholeTempo(value: number): number {
    return Math.round(value);
  }

  protected inTune(take: Take): number {
    return take.analysis.notes.filter((note) => note.verdict === 'ok').length;
  }

  protected flagged(take: Take) {
    return take.analysis.notes
      .map((note, index) => ({ ...note, number: index + 1 }))
      .filter((note) => note.verdict !== 'ok');
  }

  protected readonly mode = computed(() => {
    const entry = this.entry();
    if (this.draft() || entry?.status === 'waiting' || entry?.status === 'failed') return 'draft';
    // By touch, the note field serves the entry about to be made, unless the one just made is
    // saved (then it edits that one's note); older notes are read under "Heard before".
    if (this.touch()) return entry?.status === 'saved' && this.latest() ? 'saved' : 'draft';
    if (this.latest()) return 'saved';
    return 'none';
  });
  /** When a note being written goes out: with the entry it belongs to, or with the one to come. */
  protected readonly noteHint = computed(() =>
    this.touch() && (this.draft()?.passed ?? null) === null && this.entry()?.status !== 'waiting'
      ? 'Sent with the entry when you tap Passed or Not yet.'
      : 'Sent with the entry when you leave this field.',
  );
  protected readonly draftNote = computed(
    () => this.draft()?.note ?? this.entry()?.passOff.note ?? '',
  );
  protected readonly savedNote = linkedSignal(() => this.latest()?.note ?? '');
  protected readonly practiceLink = computed(() =>
    practiceQuery(this.requirement(), this.instrumentId() ?? 'clarinet'),
  );

  protected readonly keyText = keyText;
  protected readonly patternText = patternText;
  protected readonly articulationText = articulationText;
  protected readonly tempoText = tempoText;
  protected readonly familiesText = familiesText;
  protected readonly dateText = dateText;

  protected textOf(event: Event): string {
    return (event.target as HTMLTextAreaElement).value;
  }

  protected saveNote(): void {
    const latest = this.latest();
    if (latest) this.noteSave.emit({ passOff: latest, note: this.savedNote() });
  }
}
