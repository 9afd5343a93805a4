import { findInstrument, transpositionSize } from './instruments';
import type { InstrumentSpec, NoteRange } from './instrument-data';
import { checkKey, keyName, type Key } from './keys';
import { patternIds, patternOutline, type OutlineNote, type PatternId } from './pattern-shapes';
import { midi, spellAtMidi } from './pitch';
import { writtenKey } from './transposition';

/** How the notes of a pattern are started: each tongued, slurred, or tongued up and slurred down. */
export const articulations = ['tongued', 'slurred', 'tongue-up-slur-down'] as const;
export type Articulation = (typeof articulations)[number];

/** Whether notes are given as they sound (concert) or as the player reads them (written). */
export type PatternPitch = 'concert' | 'written';

/** How to build a pattern. */
export interface PatternOptions {
  /** Instrument id (or usual name); default 'flute'. The pattern is placed in its range. */
  instrument?: string;
  /** Default 'concert'. */
  pitch?: PatternPitch;
  /** Default 1. */
  octaves?: 1 | 2;
  /** Default 'tongued'. */
  articulation?: Articulation;
}

/** One note of a pattern. */
export interface PatternNote {
  /** Note with octave, e.g. 'C#5'. */
  note: string;
  /** Length in quarter notes (a whole note is 4). */
  beats: number;
  /** Whether the note is slurred to the note before it. */
  slurred: boolean;
}

/** Thrown when no octave of a pattern fits inside an instrument's written range. */
export class PatternRangeError extends Error {
  constructor(
    readonly patternId: PatternId,
    readonly key: Key,
    readonly instrument: InstrumentSpec,
    readonly octaves: 1 | 2,
  ) {
    const { lowest, highest } = instrument.range;
    const written = writtenKey(key, instrument.id);
    super(
      `No octave of the ${patternId} pattern in concert ${keyName(key)} ` +
        `(${octaves === 1 ? 'one octave' : 'two octaves'}, written ${keyName(written)}) ` +
        `fits the ${instrument.name} range of written ${lowest} to ${highest}.`,
    );
    this.name = 'PatternRangeError';
  }
}

/**
 * The notes of a practice pattern for one instrument.
 *
 * Octave placement happens in written pitch. Every octave of the written tonic whose whole
 * pattern lies inside the instrument's `range` is a candidate; the lowest candidate that also
 * lies inside its `beginnerRange` is chosen, and when none does, the lowest candidate. When
 * there is no candidate a PatternRangeError is thrown. With pitch 'concert' the notes are the
 * sounding notes of that same placement, spelled in the concert key (a tuba's concert Bb
 * scale starts on Bb1).
 *
 * Articulation: 'tongued' slurs nothing; 'slurred' tongues the turning note that starts each
 * run (the first tonic, the top, the tonic the arpeggio starts from) and slurs the rest of the
 * run to it, so a falling run is one slur from its top note down; 'tongue-up-slur-down' tongues
 * every rising note, the top included, and slurs every falling note to the note before it. On
 * a string instrument no slur (one bow) holds more than a bar.
 */
export function pattern(id: PatternId, key: Key, options: PatternOptions = {}): PatternNote[] {
  checkKey(key);
  if (!patternIds.includes(id)) {
    throw new Error(`Unknown pattern "${id}": expected one of ${patternIds.join(', ')}.`);
  }
  const instrument = resolveInstrument(options.instrument ?? 'flute');
  const pitch = options.pitch ?? 'concert';
  const octaves = options.octaves ?? 1;
  const articulation = options.articulation ?? 'tongued';
  checkOptions(pitch, octaves, articulation);

  const notes = placedPattern(id, key, instrument, pitch, octaves, articulation, [
    instrument.beginnerRange,
    instrument.range,
  ]);
  if (!notes) throw new PatternRangeError(id, key, instrument, octaves);
  return notes;
}

/**
 * The pattern placed at the lowest octave of the written tonic that lies inside the first of
 * `ranges` that has one (written notes), or null when none does. Shared by `pattern` and the
 * school-level placement.
 */
export function placedPattern(
  id: PatternId,
  key: Key,
  instrument: InstrumentSpec,
  pitch: PatternPitch,
  octaves: 1 | 2,
  articulation: Articulation,
  ranges: NoteRange[],
): PatternNote[] | null {
  const written = writtenKey(key, instrument.id);
  const placements: { tonic: string; outline: OutlineNote[] }[] = [];
  for (let octave = 0; octave <= 8; octave += 1) {
    const tonic = `${written.tonic}${octave}`;
    placements.push({ tonic, outline: patternOutline(id, written, tonic, octaves) });
  }
  let chosen: (typeof placements)[number] | undefined;
  for (const range of ranges) {
    chosen = placements.find(({ outline }) => fitsIn(outline, range));
    if (chosen) break;
  }
  if (!chosen) return null;

  let outline = chosen.outline;
  if (pitch === 'concert') {
    const sounding = midi(chosen.tonic) + transpositionSize(instrument.id).semitones;
    outline = patternOutline(id, key, spellAtMidi(key.tonic, sounding), octaves);
  }
  const notes = articulate(outline, articulation);
  return instrument.family === 'strings' ? withBowChanges(notes) : notes;
}

/** The most beats a school string player is asked to take in one bow (common practice, no source). */
const beatsPerBow = 4;

/**
 * A slur on a string instrument is one bow. A long slur is broken where it would hold more than
 * a bar (four beats: four seconds at quarter = 60) so a school player changes bow in time; the
 * note after the break starts a new slur, and a whole note takes a bow of its own.
 */
function withBowChanges(notes: PatternNote[]): PatternNote[] {
  let inBow = 0;
  return notes.map((note) => {
    if (note.slurred && inBow + note.beats <= beatsPerBow) {
      inBow += note.beats;
      return note;
    }
    inBow = note.beats;
    return { ...note, slurred: false };
  });
}

/** How long a pattern lasts in seconds with the quarter note at `bpm` beats per minute. */
export function durationSeconds(notes: PatternNote[], bpm: number): number {
  if (!(bpm > 0)) {
    throw new Error(`A tempo must be a positive number of beats per minute, not ${bpm}.`);
  }
  const beats = notes.reduce((total, note) => total + note.beats, 0);
  return (beats * 60) / bpm;
}

function resolveInstrument(nameOrId: string): InstrumentSpec {
  const instrument = findInstrument(nameOrId);
  if (!instrument) {
    throw new Error(`Unknown instrument "${nameOrId}".`);
  }
  return instrument;
}

function checkOptions(pitch: PatternPitch, octaves: number, articulation: Articulation): void {
  if (pitch !== 'concert' && pitch !== 'written') {
    throw new Error(`Unknown pitch "${pitch}": expected 'concert' or 'written'.`);
  }
  if (octaves !== 1 && octaves !== 2) {
    throw new Error(`A pattern spans 1 or 2 octaves, not ${octaves}.`);
  }
  if (!articulations.includes(articulation)) {
    throw new Error(
      `Unknown articulation "${articulation}": expected one of ${articulations.join(', ')}.`,
    );
  }
}

function fitsIn(outline: OutlineNote[], range: NoteRange): boolean {
  const lowest = midi(range.lowest);
  const highest = midi(range.highest);
  return outline.every(({ note }) => midi(note) >= lowest && midi(note) <= highest);
}

/*
 * Articulation. A slur begins on a tongued note, so each run of the pattern is slurred from its
 * turning note: "slurred" tongues the first tonic, the top note and the tonic where the
 * arpeggio starts, and slurs the rest of each run to them, so a falling run is slurred whole
 * from its top note down (common practice, no source: a new slur starts where the line turns).
 * "tongue-up-slur-down" tongues every note reached going up, the top included, and slurs every
 * note reached coming down to the note before it (the tonic the scale comes down to as well).
 */
function articulate(outline: OutlineNote[], articulation: Articulation): PatternNote[] {
  return outline.map(({ note, beats, group }, index) => {
    const startsRun = index === 0 || outline[index - 1].group !== group;
    const slurred =
      articulation === 'slurred'
        ? !startsRun
        : articulation === 'tongue-up-slur-down' &&
          index > 0 &&
          midi(note) < midi(outline[index - 1].note);
    return { note, beats, slurred };
  });
}
