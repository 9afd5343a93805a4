import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  computed,
  effect,
  inject,
  input,
  output,
  signal,
  untracked,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressSpinnerModule } from '@angular/material/progress-spinner';
import type { TakeAnalysis } from '@shared/listening';
import { pattern, PatternRangeError, type PatternNote } from '@shared/music';
import type { LadderRequirement } from '@shared/api/ladder';
import { analyseInWorker } from '../../practice/take-panel/take-job';
import { TakeRecorder } from '../../practice/take-panel/take-recorder';
import { Takes } from '../../practice/take-panel/takes';
import { errorMessage } from '../../core/parse';
import { TakeAnalysisView, aidSuggestion } from '../../practice/take-panel/take-analysis-view';
import { createWrite } from '../../core/state/write';

type Stage = 'idle' | 'asking' | 'recording' | 'listening' | 'heard' | 'problem';

/** The longest take the aid listens to, in seconds. */
const longestTake = 10 * 60;

/**
 * The director's own take of the student in front of them: recorded from the microphone or
 * picked from a file, analysed in the same worker as a student's take against the requirement's
 * notes for the student's instrument at the requirement's tempo. The tempo heard can fill the
 * cell; passed or not yet stays the director's key to press.
 */
@Component({
  selector: 'tb-director-take',
  imports: [MatButtonModule, MatIconModule, MatProgressSpinnerModule, TakeAnalysisView],
  templateUrl: './director-take.html',
  styleUrl: './director-take.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class DirectorTake {
  private readonly write = createWrite();
  private readonly recorder = inject(TakeRecorder);
  private readonly takes = inject(Takes);

  /** The student being heard: a kept take is theirs. */
  readonly studentId = input.required<number>();
  readonly requirement = input.required<LadderRequirement>();
  readonly instrumentId = input<string | null>(null);
  /** Fill the cell's tempo with the tempo heard. */
  readonly useTempo = output<number>();

  protected readonly stage = signal<Stage>('idle');
  protected readonly problem = signal<string | null>(null);
  protected readonly analysis = signal<TakeAnalysis | null>(null);
  /** The recording analysed, kept as evidence when the director asks. */
  private recording: Blob | null = null;
  protected readonly keeping = signal<'no' | 'saving' | 'kept'>('no');
  protected readonly keepProblem = signal<string | null>(null);
  protected readonly level = this.recorder.level;
  protected readonly levelPercent = computed(() => Math.round(this.level() * 100));
  protected readonly suggestion = computed(() => {
    const analysis = this.analysis();
    return analysis ? aidSuggestion(analysis, this.requirement().tempo) : '';
  });
  private autoStop?: ReturnType<typeof setTimeout>;

  /** The requirement's notes at concert pitch for the student's instrument, or why there are none. */
  protected readonly expected = computed((): PatternNote[] | string => {
    const requirement = this.requirement();
    const instrument = this.instrumentId();
    if (!instrument) return 'The student has no instrument on record in this ensemble.';
    try {
      return pattern(
        requirement.pattern,
        { tonic: requirement.tonic, mode: requirement.mode },
        {
          instrument,
          octaves: requirement.octaves,
          articulation: requirement.articulation,
          pitch: 'concert',
        },
      );
    } catch (error) {
      if (error instanceof PatternRangeError) return error.message;
      throw error;
    }
  });

  constructor() {
    // A new cell starts with no take.
    effect(() => {
      this.requirement();
      this.instrumentId();
      untracked(() => this.reset());
    });
    inject(DestroyRef).onDestroy(() => this.reset());
  }

  /** Records from the microphone; stops by itself a little after the pattern's length. */
  protected async record(): Promise<void> {
    const notes = this.expected();
    if (typeof notes === 'string') return;
    this.problem.set(null);
    this.analysis.set(null);
    this.stage.set('asking');
    try {
      await this.recorder.start();
    } catch {
      this.fail(
        'The microphone could not be used. Allow this site to use the microphone in the browser’s prompt (or its site settings) and try again.',
      );
      return;
    }
    this.stage.set('recording');
    const tempo = this.requirement().tempo;
    const beats = 4 + notes.reduce((total, note) => total + note.beats, 0);
    this.autoStop = setTimeout(() => void this.stop(), ((beats * 60) / tempo + 2) * 1000);
  }

  protected async stop(): Promise<void> {
    clearTimeout(this.autoStop);
    if (this.stage() !== 'recording') return;
    this.stage.set('listening');
    try {
      const take = await this.recorder.stop();
      this.recording = take.blob;
      await this.analyse(take.samples, take.sampleRate);
    } catch {
      this.fail('The recording could not be read in this browser.');
    }
  }

  /** Decodes a picked file with the browser's own decoder and analyses it. */
  protected async pick(event: Event): Promise<void> {
    const field = event.target as HTMLInputElement;
    const file = field.files?.[0];
    field.value = '';
    if (!file || typeof this.expected() === 'string') return;
    this.problem.set(null);
    this.analysis.set(null);
    this.stage.set('listening');
    const context = new AudioContext();
    let samples: Float32Array;
    let sampleRate: number;
    try {
      const decoded = await context.decodeAudioData(await file.arrayBuffer());
      samples = decoded.getChannelData(0).slice();
      sampleRate = decoded.sampleRate;
    } catch {
      this.fail(
        `“${file.name}” is not a sound file this browser can read (or it is damaged). Choose a WAV, MP3, Ogg or WebM recording.`,
      );
      return;
    } finally {
      void context.close();
    }
    if (samples.length / sampleRate > longestTake) {
      this.fail('The recording is too long: 10 minutes at most.');
      return;
    }
    this.recording = file;
    await this.analyse(samples, sampleRate);
  }

  /** Keeps the take with the student's takes, as evidence of this pass-off. */
  protected keep(): void {
    const analysis = this.analysis();
    if (!analysis || !this.recording || this.keeping() !== 'no') return;
    this.keeping.set('saving');
    this.keepProblem.set(null);
    const request = this.takes.keepHeard(
      this.recording,
      this.studentId(),
      this.requirement().code,
      this.requirement().tempo,
      analysis,
    );
    this.write.send(request, {
      next: () => this.keeping.set('kept'),
      error: (error: unknown) => {
        this.keeping.set('no');
        this.keepProblem.set(errorMessage(error, 'The take could not be kept. Try again.'));
      },
    });
  }

  private async analyse(samples: Float32Array, sampleRate: number): Promise<void> {
    const notes = this.expected();
    if (typeof notes === 'string') return;
    const answer = await analyseInWorker({
      samples,
      sampleRate,
      notes,
      tempo: this.requirement().tempo,
    });
    if ('problem' in answer) {
      this.fail(answer.problem);
      return;
    }
    this.analysis.set(answer.analysis);
    this.stage.set('heard');
  }

  protected wholeTempo(value: number): number {
    return Math.round(value);
  }

  private fail(message: string): void {
    this.stage.set('problem');
    this.problem.set(message);
  }

  private reset(): void {
    clearTimeout(this.autoStop);
    if (this.stage() === 'recording' || this.stage() === 'asking') this.recorder.cancel();
    this.stage.set('idle');
    this.problem.set(null);
    this.analysis.set(null);
    this.recording = null;
    this.keeping.set('no');
    this.keepProblem.set(null);
  }
}
