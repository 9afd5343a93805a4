import { midi as midiOf, type PatternNote } from '../music';
import { alignNotes, fitTempo, type ExpectedNote } from './note-alignment';
import { noteSegments, type HeardNote } from './note-segments';
import { pitchTrack } from './pitch-track';

/** What the listening aid heard in one note of a take. */
export type NoteVerdict = 'ok' | 'out-of-tune' | 'wrong-note' | 'missed';

/** One expected note of a take and what was heard for it. */
export interface NoteAnalysis {
  /** The expected note at concert pitch, e.g. 'F#4'. */
  expected: string;
  /** The nearest note to what was heard in its place, or null when it was missed. */
  heard: string | null;
  /** Cents from the expected note at the take's A4, negative = flat; null when missed. */
  centsOff: number | null;
  /** Seconds from the start of the recording; null when missed. */
  onset: number | null;
  verdict: NoteVerdict;
}

/** What the listening aid heard in a take of a practice pattern. */
export interface TakeAnalysis {
  /** The quarter-note tempo the player kept, or null when too few notes were heard to tell. */
  tempo: number | null;
  /** One entry per expected note, in order. */
  notes: NoteAnalysis[];
  /** Share of expected notes judged 'ok', 0..1. */
  pitchAccuracy: number;
  /** Notes heard that the pattern does not have. */
  extraNotes: number;
}

/** How a recording can be unusable, each with its own message. */
export type TakeProblem = 'empty' | 'not-audio' | 'sample-rate' | 'too-long' | 'no-notes';

/** A recording the listening aid cannot analyse; `message` says why in plain words. */
export class TakeError extends Error {
  constructor(
    readonly problem: TakeProblem,
    message: string,
  ) {
    super(message);
    this.name = 'TakeError';
  }
}

/** The longest take analysed, in seconds. */
export const longestTakeSeconds = 600;
/** The sample rates a take may have, in hertz. */
export const takeSampleRates = { lowest: 16_000, highest: 96_000 } as const;

/** Cents of tolerance within which a note is 'ok' unless told otherwise. */
const defaultToleranceCents = 25;
/** From here on a note is another note (half a semitone). */
const wrongNoteCents = 50;

/**
 * Listens to a take of a practice pattern: which notes were played, how far each was from
 * its expected pitch, when it started, and the tempo kept.
 *
 * `expected` are the pattern's notes at concert pitch as `pattern()` gives them; `bpm` the
 * quarter-note tempo asked. Notes are found in a pitch track (McLeod pitch method, see
 * {@link pitchTrack}), cut at silences, tongued attacks and pitch changes ({@link noteSegments}),
 * then paired with the expected notes by a sequence alignment that allows missed and extra
 * notes ({@link alignNotes}). Throws a {@link TakeError} for a recording it cannot use.
 */
export function analyseTake(
  samples: Float32Array,
  sampleRate: number,
  expected: PatternNote[],
  bpm: number,
  options: { a4?: number; toleranceCents?: number } = {},
): TakeAnalysis {
  const a4 = options.a4 ?? 440;
  const tolerance = options.toleranceCents ?? defaultToleranceCents;
  checkArguments(expected, bpm, a4, tolerance);
  checkRecording(samples, sampleRate);

  const track = pitchTrack(samples, sampleRate, a4);
  const shortestBeats = Math.min(...expected.map((note) => note.beats));
  const shortestSeconds = Math.min(0.1, Math.max(0.05, (0.4 * shortestBeats * 60) / bpm));
  const heard = noteSegments(track, shortestSeconds);
  checkHeard(heard, track.levelDb, track.hopSeconds);

  let beat = 0;
  const targets: ExpectedNote[] = expected.map((note) => {
    const target = { midi: midiOf(note.note), beat };
    beat += note.beats;
    return target;
  });
  const { heardIndex, extra } = alignNotes(targets, heard);
  const fit = fitTempo(targets, heard, heardIndex);
  const useFlats = expected.some((note) => /^[A-G]b/.test(note.note));

  const notes = expected.map((note, i): NoteAnalysis => {
    const j = heardIndex[i]!;
    if (j < 0)
      return { expected: note.note, heard: null, centsOff: null, onset: null, verdict: 'missed' };
    const { midi, onset } = heard[j]!;
    const cents = Math.round((midi - targets[i]!.midi) * 1000) / 10;
    const nearest = Math.round(midi);
    const verdict: NoteVerdict =
      Math.abs(cents) >= wrongNoteCents
        ? 'wrong-note'
        : Math.abs(cents) <= tolerance
          ? 'ok'
          : 'out-of-tune';
    return {
      expected: note.note,
      heard: nearest === targets[i]!.midi ? note.note : noteName(nearest, useFlats),
      centsOff: cents,
      onset: Math.round(onset * 1000) / 1000,
      verdict,
    };
  });
  const ok = notes.filter((note) => note.verdict === 'ok').length;
  return {
    tempo: fit ? Math.round(600 / fit.secondsPerBeat) / 10 : null,
    notes,
    pitchAccuracy: ok / notes.length,
    extraNotes: extra,
  };
}

function checkArguments(expected: PatternNote[], bpm: number, a4: number, tolerance: number): void {
  if (!Array.isArray(expected) || expected.length === 0) {
    throw new Error('A take is analysed against a pattern with at least one note.');
  }
  if (!(Number.isFinite(bpm) && bpm > 0)) {
    throw new Error(`A tempo must be a positive number of beats per minute, not ${bpm}.`);
  }
  if (!(Number.isFinite(a4) && a4 >= 400 && a4 <= 480)) {
    throw new Error(`A4 must be between 400 and 480 Hz, not ${a4}.`);
  }
  if (!(Number.isFinite(tolerance) && tolerance > 0 && tolerance < wrongNoteCents)) {
    throw new Error(`The tolerance must be more than 0 and less than 50 cents, not ${tolerance}.`);
  }
}

function checkRecording(samples: Float32Array, sampleRate: number): void {
  if (!(samples instanceof Float32Array) || samples.length === 0) {
    throw new TakeError('empty', 'The recording is empty.');
  }
  if (
    !Number.isFinite(sampleRate) ||
    sampleRate < takeSampleRates.lowest ||
    sampleRate > takeSampleRates.highest
  ) {
    throw new TakeError(
      'sample-rate',
      `The recording's sample rate is ${sampleRate} Hz; the listening aid hears takes at ` +
        `16 to 96 kHz (record at 44.1 or 48 kHz).`,
    );
  }
  if (samples.length / sampleRate > longestTakeSeconds) {
    throw new TakeError('too-long', 'The recording is too long: 10 minutes at most.');
  }
  for (let i = 0; i < samples.length; i += 1) {
    if (!Number.isFinite(samples[i]!)) {
      throw new TakeError(
        'not-audio',
        'The recording is damaged: it holds values that are not sound.',
      );
    }
  }
}

/**
 * Refuses a take with no steady notes, or where steady notes fill less than a quarter of the time
 * something loud was sounding: speech and noise have pitch only in short, gliding stretches.
 */
function checkHeard(heard: HeardNote[], levelDb: Float32Array, hopSeconds: number): void {
  const sorted = Float32Array.from(levelDb).sort();
  const loud = sorted[Math.floor(0.99 * (sorted.length - 1))] ?? -180;
  let sounding = 0;
  for (const level of levelDb) if (level >= loud - 30 && level > -60) sounding += 1;
  const steady = heard.reduce((total, note) => total + note.duration, 0);
  if (heard.length === 0 || steady < 0.25 * sounding * hopSeconds) {
    throw new TakeError(
      'no-notes',
      'No notes heard: the recording holds no steady pitches (silence, noise or speech?).',
    );
  }
}

const sharpNames = ['C', 'C#', 'D', 'D#', 'E', 'F', 'F#', 'G', 'G#', 'A', 'A#', 'B'];
const flatNames = ['C', 'Db', 'D', 'Eb', 'E', 'F', 'Gb', 'G', 'Ab', 'A', 'Bb', 'B'];

function noteName(midi: number, useFlats: boolean): string {
  const names = useFlats ? flatNames : sharpNames;
  return `${names[((midi % 12) + 12) % 12]}${Math.floor(midi / 12) - 1}`;
}
