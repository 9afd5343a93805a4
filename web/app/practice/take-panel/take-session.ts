import { computed, DestroyRef, inject, signal } from '@angular/core';
import type { TakeAnalysis } from '@shared/listening';
import type { PatternNote } from '@shared/music';
import { analyseInWorker } from './take-job';
import { TakeRecorder } from './take-recorder';

/** Where a take is: waiting, the browser's microphone prompt, recording, analysing, heard. */
export type TakeStage = 'idle' | 'asking' | 'recording' | 'listening' | 'heard' | 'problem';

/** What a take is heard against: the notes at concert pitch and the tempo asked. */
export interface TakeTarget {
  notes: PatternNote[];
  tempo: number;
}

/** What runs as recording begins (`started`) and as it ends (`stopping`): a count-in's metronome. */
export interface TakeHooks {
  started?: () => void;
  stopping?: () => void;
}

/**
 * One take at a time, from the microphone or a file, heard by the listening aid in its worker
 * against `target()` (a string says why there is nothing to hear): the state a student's take
 * panel and a director's take of a student share. Build it in an injection context (a field
 * initialiser): the microphone is let go when the panel goes.
 */
export class TakeSession {
  private readonly recorder = inject(TakeRecorder);
  private readonly stageNow = signal<TakeStage>('idle');
  private readonly heard = signal<TakeAnalysis | null>(null);
  private recorded: Blob | null = null;
  private autoStop?: ReturnType<typeof setTimeout>;

  readonly stage = this.stageNow.asReadonly();
  /** What went wrong, for the user; the panel may set its own (a keep that failed). */
  readonly problem = signal<string | null>(null);
  readonly analysis = this.heard.asReadonly();
  /** The microphone's level, 0..1, while recording, and the same as a whole percent. */
  readonly level = this.recorder.level;
  readonly levelPercent = computed(() => Math.round(this.level() * 100));

  constructor(
    private readonly target: () => TakeTarget | string,
    private readonly hooks: TakeHooks = {},
  ) {
    inject(DestroyRef).onDestroy(() => this.reset());
  }

  /** The recording heard last (the microphone's take or the file picked), to keep. */
  recording(): Blob | null {
    return this.recorded;
  }

  /** Asks for the microphone and records; stops by itself a little after the pattern's length. */
  async record(): Promise<void> {
    const wanted = this.target();
    if (typeof wanted === 'string') return;
    this.listening();
    this.stageNow.set('asking');
    try {
      await this.recorder.start();
    } catch {
      this.fail(
        'The microphone could not be used. Allow this site to use the microphone in the browser’s prompt (or its site settings) and try again.',
      );
      return;
    }
    this.stageNow.set('recording');
    this.hooks.started?.();
    // A measure of count-in (four beats), the pattern, then two seconds to spare.
    const beats = 4 + wanted.notes.reduce((total, note) => total + note.beats, 0);
    this.autoStop = setTimeout(() => void this.stop(), ((beats * 60) / wanted.tempo + 2) * 1000);
  }

  /** Stops recording and has the take heard. */
  async stop(): Promise<void> {
    clearTimeout(this.autoStop);
    if (this.stage() !== 'recording') return;
    this.hooks.stopping?.();
    this.stageNow.set('listening');
    try {
      const take = await this.recorder.stop();
      await this.hear(take.samples, take.sampleRate, take.blob);
    } catch {
      this.fail('The recording could not be read in this browser.');
    }
  }

  /** Clears the last take and shows that one is being heard (a file being decoded). */
  listening(): void {
    this.problem.set(null);
    this.heard.set(null);
    this.stageNow.set('listening');
  }

  /** Has `samples` heard, `recording` being the file they came from. */
  async hear(samples: Float32Array, sampleRate: number, recording: Blob): Promise<void> {
    const wanted = this.target();
    if (typeof wanted === 'string') return;
    this.recorded = recording;
    const answer = await analyseInWorker({ samples, sampleRate, ...wanted });
    if ('problem' in answer) {
      this.fail(answer.problem);
      return;
    }
    this.heard.set(answer.analysis);
    this.stageNow.set('heard');
  }

  /** Shows `message` as the take's problem. */
  fail(message: string): void {
    this.stageNow.set('problem');
    this.problem.set(message);
  }

  /** Back to no take, letting the microphone go. */
  reset(): void {
    clearTimeout(this.autoStop);
    if (this.stage() === 'recording' || this.stage() === 'asking') this.recorder.cancel();
    this.stageNow.set('idle');
    this.problem.set(null);
    this.heard.set(null);
    this.recorded = null;
  }
}
