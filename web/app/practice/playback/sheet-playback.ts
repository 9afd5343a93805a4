import { Injectable, signal } from '@angular/core';
import { frequency, type PatternNote } from '@shared/music';

type ToneModule = typeof import('tone');

/** Beats of the count-in: one measure of 4/4. */
const countInBeats = 4;

/**
 * Plays a pattern at concert pitch with a metronome click on every beat after a one-measure
 * count-in. Tone.js is loaded on the first Play, and the audio context is created and resumed
 * inside the click itself, because browsers only start Web Audio from a user gesture.
 */
@Injectable({ providedIn: 'root' })
export class SheetPlayback {
  /** Whether the pattern is playing (or counting in). */
  readonly playing = signal(false);
  /** Whether Tone.js is still being fetched for the first Play. */
  readonly loading = signal(false);
  /** Why playback could not start, if it could not. */
  readonly problem = signal<string | null>(null);

  private audioContext?: AudioContext;
  private tone?: Promise<ToneModule>;
  private stopPlaying?: () => void;

  /** Starts the pattern; call it from a click or key handler. */
  async play(notes: PatternNote[], tempo: number): Promise<void> {
    this.stop();
    this.problem.set(null);
    // Created and resumed synchronously in the gesture, before any await.
    this.audioContext ??= new AudioContext();
    const resumed = this.audioContext.resume();
    this.loading.set(true);
    try {
      this.tone ??= import('tone');
      const Tone = await this.tone;
      await resumed;
      if (Tone.getContext().rawContext !== this.audioContext) Tone.setContext(this.audioContext);
      this.stopPlaying = this.schedule(Tone, notes, tempo);
      this.playing.set(true);
    } catch (error) {
      console.error(error);
      this.problem.set('Playback could not start in this browser.');
    } finally {
      this.loading.set(false);
    }
  }

  /** Stops the pattern and the metronome. */
  stop(): void {
    this.stopPlaying?.();
    this.stopPlaying = undefined;
    this.playing.set(false);
  }

  private schedule(Tone: ToneModule, notes: PatternNote[], tempo: number): () => void {
    const secondsPerBeat = 60 / tempo;
    const melody = new Tone.Synth({
      oscillator: { type: 'triangle' },
      envelope: { attack: 0.02, decay: 0.1, sustain: 0.8, release: 0.12 },
    }).toDestination();
    melody.volume.value = -8;
    const click = new Tone.Synth({
      oscillator: { type: 'square' },
      envelope: { attack: 0.001, decay: 0.04, sustain: 0, release: 0.02 },
    }).toDestination();
    click.volume.value = -18;

    const start = Tone.now() + 0.15;
    const patternBeats = notes.reduce((total, note) => total + note.beats, 0);
    const totalBeats = countInBeats + Math.ceil(patternBeats);
    for (let beat = 0; beat < totalBeats; beat += 1) {
      // The first beat of each measure clicks higher, as a metronome's bell does.
      const pitch = beat % 4 === 0 ? 1760 : 1320;
      click.triggerAttackRelease(pitch, 0.03, start + beat * secondsPerBeat);
    }
    let beat = countInBeats;
    notes.forEach((note, index) => {
      const slurredOn = notes[index + 1]?.slurred ?? false;
      // Tongued notes are a little detached; a note slurred into the next one is held full length.
      const length = note.beats * secondsPerBeat * (slurredOn ? 1 : 0.86);
      melody.triggerAttackRelease(frequency(note.note), length, start + beat * secondsPerBeat);
      beat += note.beats;
    });

    const endsIn = (start - Tone.now() + totalBeats * secondsPerBeat + 0.3) * 1000;
    const timer = setTimeout(() => this.stop(), endsIn);
    return () => {
      clearTimeout(timer);
      melody.dispose();
      click.dispose();
    };
  }
}
