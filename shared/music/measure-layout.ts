import type { PatternNote } from './patterns';

/** Beats in a measure of 4/4. */
export const beatsPerMeasure = 4;

/** One written symbol: a note or rest of a single notated value, possibly tied. */
export interface NotatedPiece {
  /** Note with octave, or null for a rest. */
  note: string | null;
  beats: number;
  /** Beats from the start of the measure. */
  offset: number;
  type: string;
  dotted: boolean;
  tieStart: boolean;
  tieStop: boolean;
  slurStart: boolean;
  slurStop: boolean;
}

/** Notated values from longest to shortest: beats, MusicXML note type, dotted. */
const noteValues: [number, string, boolean][] = [
  [4, 'whole', false],
  [3, 'half', true],
  [2, 'half', false],
  [1.5, 'quarter', true],
  [1, 'quarter', false],
  [0.75, 'eighth', true],
  [0.5, 'eighth', false],
  [0.375, '16th', true],
  [0.25, '16th', false],
  [0.125, '32nd', false],
];

/**
 * The smallest number of divisions per quarter note (1, 2, 4 or 8) that gives every note a
 * whole number of divisions.
 */
export function divisionsFor(notes: PatternNote[]): number {
  const divisions = [1, 2, 4, 8].find((candidate) =>
    notes.every(({ beats }) => Number.isInteger(beats * candidate)),
  );
  if (divisions === undefined) {
    throw new Error('Note lengths must be multiples of a thirty-second note (1/8 beat).');
  }
  return divisions;
}

/**
 * Lays notes into 4/4 measures. A note that crosses a bar line, or whose length is not one
 * notated value, becomes tied pieces; slurs start on a run's first piece and stop on its last.
 * The last measure is filled with rests.
 */
export function layOutMeasures(notes: PatternNote[]): NotatedPiece[][] {
  const measures: NotatedPiece[][] = [[]];
  let offset = 0;
  const place = (note: string | null, beats: number, marks: SlurMarks) => {
    let remaining = beats;
    let first = true;
    while (remaining > 0) {
      if (offset === beatsPerMeasure) {
        measures.push([]);
        offset = 0;
      }
      const [length, type, dotted] = longestValue(Math.min(remaining, beatsPerMeasure - offset));
      remaining -= length;
      const last = remaining <= 0;
      measures[measures.length - 1].push({
        note,
        beats: length,
        offset,
        type,
        dotted,
        tieStart: note !== null && !last,
        tieStop: note !== null && !first,
        slurStart: marks.slurStart && first,
        slurStop: marks.slurStop && last,
      });
      offset += length;
      first = false;
    }
  };
  notes.forEach((note, index) => {
    if (!(note.beats > 0)) {
      throw new Error(`A note must last a positive number of beats, not ${note.beats}.`);
    }
    place(note.note, note.beats, slurMarks(notes, index));
  });
  if (offset < beatsPerMeasure) {
    place(null, beatsPerMeasure - offset, { slurStart: false, slurStop: false });
  }
  return measures;
}

interface SlurMarks {
  slurStart: boolean;
  slurStop: boolean;
}

function slurMarks(notes: PatternNote[], index: number): SlurMarks {
  const joinedToPrevious = index > 0 && notes[index].slurred;
  const joinedToNext = index + 1 < notes.length && notes[index + 1].slurred;
  return {
    slurStart: !joinedToPrevious && joinedToNext,
    slurStop: joinedToPrevious && !joinedToNext,
  };
}

function longestValue(beats: number): [number, string, boolean] {
  const value = noteValues.find(([length]) => length <= beats + 1e-9);
  if (!value) {
    throw new Error(`${beats} beats cannot be notated.`);
  }
  return value;
}

/** The beam of an eighth note that shares its beat with one neighbour eighth, if any. */
export function beamOf(measure: NotatedPiece[], index: number): 'begin' | 'end' | undefined {
  const isPlainEighth = (piece?: NotatedPiece) =>
    piece !== undefined && piece.note !== null && piece.type === 'eighth' && !piece.dotted;
  const piece = measure[index];
  if (!isPlainEighth(piece)) return undefined;
  const onBeat = Number.isInteger(piece.offset);
  if (onBeat && isPlainEighth(measure[index + 1])) return 'begin';
  if (!onBeat && isPlainEighth(measure[index - 1]) && Number.isInteger(measure[index - 1].offset)) {
    return 'end';
  }
  return undefined;
}
