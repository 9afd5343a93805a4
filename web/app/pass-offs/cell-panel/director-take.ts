import {
  ChangeDetectionStrategy,
  Component,
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
import { pattern, PatternRangeError, type PatternNote } from '@shared/music';
import type { LadderRequirement } from '@shared/api/ladder';
import { TakeSession } from '../../practice/take-panel/take-session';
import { Takes } from '../../practice/take-panel/takes';
import { errorMessage } from '../../core/parse';
import { TakeAnalysisView, aidSuggestion } from '../../practice/take-panel/take-analysis-view';
import { createWrite } from '../../core/state/write';

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
  private readonly takes = inject(Takes);

  /** The student being heard: a kept take is theirs. */
  readonly studentId = input.required<number>();
  readonly requirement = input.required<LadderRequirement>();
  readonly instrumentId = input<string | null>(null);
  /** Fill the cell's tempo with the tempo heard. */
  readonly useTempo = output<number>();

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
  private readonly take = new TakeSession(() => {
    const notes = this.expected();
    return typeof notes === 'string' ? notes : { notes, tempo: this.requirement().tempo };
  });
  protected readonly stage = this.take.stage;
  protected readonly problem = this.take.problem;
  protected readonly analysis = this.take.analysis;
  protected readonly level = this.take.level;
  protected readonly levelPercent = this.take.levelPercent;
  protected readonly keeping = signal<'no' | 'saving' | 'kept'>('no');
  protected readonly keepProblem = signal<string | null>(null);
  protected readonly suggestion = computed(() => {
    const analysis = this.analysis();
    return analysis ? aidSuggestion(analysis, this.requirement().tempo) : '';
  });

  constructor() {
    // A new cell starts with no take.
    effect(() => {
      this.requirement();
      this.instrumentId();
      untracked(() => this.reset());
    });
  }

  /** Records from the microphone; stops by itself a little after the pattern's length. */
  protected record(): Promise<void> {
    return this.take.record();
  }

  protected stop(): Promise<void> {
    return this.take.stop();
  }

  /** Decodes a picked file with the browser's own decoder and analyses it. */
  protected async pick(event: Event): Promise<void> {
    const field = event.target as HTMLInputElement;
    const file = field.files?.[0];
    field.value = '';
    if (!file || typeof this.expected() === 'string') return;
    this.take.listening();
    const context = new AudioContext();
    let samples: Float32Array;
    let sampleRate: number;
    try {
      const decoded = await context.decodeAudioData(await file.arrayBuffer());
      samples = decoded.getChannelData(0).slice();
      sampleRate = decoded.sampleRate;
    } catch {
      this.take.fail(
        `“${file.name}” is not a sound file this browser can read (or it is damaged). Choose a WAV, MP3, Ogg or WebM recording.`,
      );
      return;
    } finally {
      void context.close();
    }
    if (samples.length / sampleRate > longestTake) {
      this.take.fail('The recording is too long: 10 minutes at most.');
      return;
    }
    await this.take.hear(samples, sampleRate, file);
  }

  /** Keeps the take with the student's takes, as evidence of this pass-off. */
  protected keep(): void {
    const analysis = this.analysis();
    const recording = this.take.recording();
    if (!analysis || !recording || this.keeping() !== 'no') return;
    this.keeping.set('saving');
    this.keepProblem.set(null);
    const request = this.takes.keepHeard(
      recording,
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

  protected wholeTempo(value: number): number {
    return Math.round(value);
  }

  private reset(): void {
    this.take.reset();
    this.keeping.set('no');
    this.keepProblem.set(null);
  }
}
