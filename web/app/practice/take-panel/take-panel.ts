import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  computed,
  inject,
  input,
  signal,
} from '@angular/core';
import { HttpErrorResponse } from '@angular/common/http';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressSpinnerModule } from '@angular/material/progress-spinner';
import type { TakeAnalysis } from '@shared/listening';
import type { PatternNote } from '@shared/music';
import type { Take } from '@shared/api/take';
import { apiErrorOf } from '../../core/parse';
import { SheetPlayback } from '../playback/sheet-playback';
import { analyseInWorker } from './take-job';
import { TakeRecorder, type RecordedTake } from './take-recorder';
import { Takes } from './takes';
import { TakeAnalysisView } from './take-analysis-view';
import { createWrite } from '../../core/state/write';

export { verdictLabels } from './take-analysis-view';

type Stage = 'idle' | 'asking' | 'recording' | 'listening' | 'heard' | 'problem';

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
  private readonly recorder = inject(TakeRecorder);
  private readonly playback = inject(SheetPlayback);
  private readonly takes = inject(Takes);

  /** The pattern's notes at concert pitch. */
  readonly notes = input.required<PatternNote[]>();
  readonly tempo = input.required<number>();
  /** The requirement the sheet is for, when opened from a student's ladder; needed to send. */
  readonly requirementCode = input<string>();

  protected readonly stage = signal<Stage>('idle');
  protected readonly problem = signal<string | null>(null);
  protected readonly analysis = signal<TakeAnalysis | null>(null);
  protected readonly kept = signal<Take | null>(null);
  protected readonly saving = this.write.saving;
  protected readonly level = this.recorder.level;
  private recorded?: RecordedTake;
  private autoStop?: ReturnType<typeof setTimeout>;

  constructor() {
    inject(DestroyRef).onDestroy(() => {
      clearTimeout(this.autoStop);
      this.recorder.cancel();
    });
  }

  protected readonly levelPercent = computed(() => Math.round(this.level() * 100));
  /** Starts: asks for the microphone, counts in, records; stops by itself after the pattern. */
  protected async record(): Promise<void> {
    this.problem.set(null);
    this.analysis.set(null);
    this.kept.set(null);
    this.stage.set('asking');
    try {
      await this.recorder.start();
    } catch {
      this.stage.set('problem');
      this.problem.set(
        'The microphone could not be used. Allow this site to use the microphone in the browser’s prompt (or its site settings) and try again.',
      );
      return;
    }
    this.stage.set('recording');
    void this.playback.play([], this.tempo());
    const beats = 4 + this.notes().reduce((total, note) => total + note.beats, 0);
    this.autoStop = setTimeout(() => void this.stop(), ((beats * 60) / this.tempo() + 2) * 1000);
  }

  /** Stops recording and has the take analysed in a worker. */
  protected async stop(): Promise<void> {
    clearTimeout(this.autoStop);
    if (this.stage() !== 'recording') return;
    this.playback.stop();
    this.stage.set('listening');
    try {
      this.recorded = await this.recorder.stop();
    } catch {
      this.stage.set('problem');
      this.problem.set('The recording could not be read in this browser.');
      return;
    }
    const answer = await analyseInWorker({
      samples: this.recorded.samples.slice(),
      sampleRate: this.recorded.sampleRate,
      notes: this.notes(),
      tempo: this.tempo(),
    });
    if ('problem' in answer) {
      this.stage.set('problem');
      this.problem.set(answer.problem);
      return;
    }
    this.analysis.set(answer.analysis);
    this.stage.set('heard');
  }

  /** Keeps the take on the server and sends it to the student's directors. */
  protected keepAndSend(): void {
    const analysis = this.analysis();
    const code = this.requirementCode();
    if (!analysis || !code || !this.recorded) return;
    this.write.send(this.takes.keep(this.recorded.blob, code, this.tempo(), analysis), {
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
