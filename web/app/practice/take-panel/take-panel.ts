import { ChangeDetectionStrategy, Component, inject, input, signal } from '@angular/core';
import { HttpErrorResponse } from '@angular/common/http';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressSpinnerModule } from '@angular/material/progress-spinner';
import type { PatternNote } from '@shared/music';
import type { Take } from '@shared/api/take';
import { apiErrorOf } from '../../core/parse';
import { SheetPlayback } from '../playback/sheet-playback';
import { TakeSession } from './take-session';
import { Takes } from './takes';
import { TakeAnalysisView } from './take-analysis-view';
import { createWrite } from '../../core/state/write';

export { verdictLabels } from './take-analysis-view';

/**
 * Record a take of the sheet: the microphone (after the browser's permission prompt), a
 * one-measure count-in on the sheet's metronome, then what the listening aid heard, note by
 * note, with a line of cents and the tempo kept against the tempo asked. A student can keep the
 * take and send it to their director; the aid only suggests.
 */
@Component({
  selector: 'tb-take-panel',
  imports: [MatButtonModule, MatIconModule, MatProgressSpinnerModule, TakeAnalysisView],
  templateUrl: './take-panel.html',
  styleUrl: './take-panel.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TakePanel {
  private readonly write = createWrite();
  private readonly playback = inject(SheetPlayback);
  private readonly takes = inject(Takes);

  /** The pattern's notes at concert pitch. */
  readonly notes = input.required<PatternNote[]>();
  readonly tempo = input.required<number>();
  /** The requirement the sheet is for, when opened from a student's ladder; needed to send. */
  readonly requirementCode = input<string>();

  private readonly take = new TakeSession(() => ({ notes: this.notes(), tempo: this.tempo() }), {
    // The sheet's metronome counts the take in, and stops with it.
    started: () => void this.playback.play([], this.tempo()),
    stopping: () => this.playback.stop(),
  });
  protected readonly stage = this.take.stage;
  protected readonly problem = this.take.problem;
  protected readonly analysis = this.take.analysis;
  protected readonly level = this.take.level;
  protected readonly levelPercent = this.take.levelPercent;
  protected readonly kept = signal<Take | null>(null);
  protected readonly saving = this.write.saving;

  /** Starts: asks for the microphone, counts in, records; stops by itself after the pattern. */
  protected record(): Promise<void> {
    this.kept.set(null);
    return this.take.record();
  }

  /** Stops recording and has the take analysed in a worker. */
  protected stop(): Promise<void> {
    return this.take.stop();
  }

  /** Keeps the take on the server and sends it to the student's directors. */
  protected keepAndSend(): void {
    const analysis = this.analysis();
    const code = this.requirementCode();
    const recording = this.take.recording();
    if (!analysis || !code || !recording) return;
    this.write.send(this.takes.keep(recording, code, this.tempo(), analysis), {
      next: (take) =>
        this.write.send(this.takes.send(take.id), {
          next: (sent) => {
            this.kept.set(sent);
          },
          error: (error: unknown) => this.failed(error),
        }),
      error: (error: unknown) => this.failed(error),
    });
  }

  private failed(error: unknown): void {
    const message =
      error instanceof HttpErrorResponse
        ? (apiErrorOf(error)?.message ?? error.message)
        : 'The take could not be sent.';
    this.problem.set(message);
  }
}
