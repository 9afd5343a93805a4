import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { NoteVerdict, TakeAnalysis } from '@shared/listening';

/** Words for each verdict, so a note's state never rests on its colour alone. */
export const verdictLabels: Record<NoteVerdict, string> = {
  ok: 'In tune',
  'out-of-tune': 'Out of tune',
  'wrong-note': 'Wrong note',
  missed: 'Missed',
};

/**
 * What the listening aid heard in one take: the tempo kept against the tempo asked, each note
 * labelled in words and coloured by its verdict, and a line of cents from each expected note.
 */
@Component({
  selector: 'tb-take-analysis-view',
  templateUrl: './take-analysis-view.html',
  styleUrl: './take-analysis-view.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TakeAnalysisView {
  readonly analysis = input.required<TakeAnalysis>();
  /** The tempo the requirement asks. */
  readonly tempo = input.required<number>();

  protected readonly okCount = computed(
    () => this.analysis().notes.filter((note) => note.verdict === 'ok').length,
  );
  /** The cents line: one point per heard note, ±50 cents across the strip's height. */
  protected readonly centsPoints = computed(() => {
    const notes = this.analysis().notes;
    const width = 100 / Math.max(1, notes.length);
    return notes
      .map((note, index) =>
        note.centsOff === null
          ? null
          : { x: width * (index + 0.5), y: 50 - Math.max(-50, Math.min(50, note.centsOff)) },
      )
      .filter((point): point is { x: number; y: number } => point !== null);
  });
  protected readonly centsPath = computed(() =>
    this.centsPoints()
      .map((point) => `${point.x.toFixed(2)},${point.y.toFixed(2)}`)
      .join(' '),
  );

  protected verdictText(note: { verdict: NoteVerdict; centsOff: number | null }): string {
    const label = verdictLabels[note.verdict];
    if (note.centsOff === null || note.verdict === 'wrong-note') return label;
    const cents = Math.round(note.centsOff);
    return `${label}, ${cents > 0 ? '+' : ''}${cents} ¢`;
  }
}

/**
 * What the listening aid would suggest, in words: passed when every note was in tune, nothing
 * extra was played and the tempo held (within 2 beats per minute of the tempo asked). A person
 * decides; this is only a suggestion.
 */
export function aidSuggestion(analysis: TakeAnalysis, tempoAsked: number): string {
  const kept = analysis.tempo !== null && analysis.tempo >= tempoAsked - 2;
  return analysis.pitchAccuracy === 1 && analysis.extraNotes === 0 && kept
    ? 'The aid suggests: passed'
    : 'The aid suggests: not yet';
}
