/** A letter name of the musical alphabet. */
export type Letter = 'C' | 'D' | 'E' | 'F' | 'G' | 'A' | 'B';

/** The seven letters in scale order from C, so a letter's index is its diatonic step. */
export const letters: readonly Letter[] = ['C', 'D', 'E', 'F', 'G', 'A', 'B'];

/** Semitones above C of each natural letter, in the order of `letters`. */
const naturalSemitones = [0, 2, 4, 5, 7, 9, 11];

/**
 * A spelled pitch: a letter, its alteration in semitones (−2 to +2) and, when the pitch is
 * placed, its octave in scientific pitch notation (C4 is middle C).
 */
export interface SpelledPitch {
  letter: Letter;
  alteration: number;
  octave?: number;
}

const notePattern = /^([A-G])(##|#|bb|b)?(-?\d+)?$/;

const accidentalAlterations: Record<string, number> = { '': 0, '#': 1, '##': 2, b: -1, bb: -2 };

/**
 * Reads a note name such as 'C#5', 'Bb', 'Ebb3' or 'F##4'. Accidentals are '#', '##', 'b'
 * and 'bb'; the octave is optional unless `requireOctave` is set.
 */
export function parseNote(note: string, requireOctave = false): SpelledPitch {
  const match = notePattern.exec(note.trim());
  if (!match) {
    throw new Error(
      `Unknown note "${note}": expected a letter A–G, an optional accidental (#, ##, b, bb) and an octave number, e.g. "Bb3".`,
    );
  }
  const [, letter, accidental = '', octave] = match;
  if (requireOctave && octave === undefined) {
    throw new Error(`The note "${note}" needs an octave number, e.g. "${note}4".`);
  }
  return {
    letter: letter as Letter,
    alteration: accidentalAlterations[accidental],
    ...(octave === undefined ? {} : { octave: Number(octave) }),
  };
}

/** Writes a spelled pitch back as a note name ('C#5', or 'C#' without an octave). */
export function formatNote(pitch: SpelledPitch): string {
  const accidental = accidentalText(pitch.alteration);
  return `${pitch.letter}${accidental}${pitch.octave ?? ''}`;
}

function accidentalText(alteration: number): string {
  if (alteration > 2 || alteration < -2) {
    throw new Error(
      `A pitch ${alteration > 0 ? 'sharpened' : 'flattened'} by ${Math.abs(alteration)} semitones cannot be spelled with '#', '##', 'b' or 'bb'.`,
    );
  }
  return alteration >= 0 ? '#'.repeat(alteration) : 'b'.repeat(-alteration);
}

/** The diatonic step of a letter, C = 0 … B = 6. */
export function letterStep(letter: Letter): number {
  return letters.indexOf(letter);
}

/** Semitones of a spelled pitch above C of its own octave (may fall outside 0–11, e.g. Cb = −1). */
export function semitonesAboveC(pitch: SpelledPitch): number {
  return naturalSemitones[letterStep(pitch.letter)] + pitch.alteration;
}

/** The pitch class 0–11 of a note name with or without octave (C = 0). */
export function pitchClass(note: string): number {
  const semitones = semitonesAboveC(parseNote(note));
  return ((semitones % 12) + 12) % 12;
}

/**
 * The MIDI note number of a note with octave. Octaves follow scientific pitch notation, so
 * C4 = 60 (the MIDI 1.0 Detailed Specification's middle C), B#3 = 60 and Cb4 = 59.
 */
export function midi(note: string): number {
  const pitch = parseNote(note, true);
  return ((pitch.octave as number) + 1) * 12 + semitonesAboveC(pitch);
}

/** The equal-tempered frequency in hertz of a note with octave, tuned to `a4` (ISO 16: 440 Hz). */
export function frequency(note: string, a4 = 440): number {
  return a4 * 2 ** ((midi(note) - 69) / 12);
}

/**
 * Places a pitch name without octave in the octave that gives it the MIDI number `target`;
 * the name must be an enharmonic spelling of that pitch.
 */
export function spellAtMidi(name: string, target: number): string {
  const pitch = parseNote(name);
  const octave = (target - semitonesAboveC(pitch)) / 12 - 1;
  if (!Number.isInteger(octave)) {
    throw new Error(`${name} is not a spelling of MIDI note ${target}.`);
  }
  return formatNote({ letter: pitch.letter, alteration: pitch.alteration, octave });
}

/** The note name without its octave ('C#5' → 'C#'). */
export function withoutOctave(note: string): string {
  const pitch = parseNote(note);
  return formatNote({ letter: pitch.letter, alteration: pitch.alteration });
}
