import { transposeNote, type Interval } from './interval';
import { checkKey, keySignature, type Key, type Mode } from './keys';
import { pitchClass } from './pitch';

/** A scale's direction: ascending or descending. */
export type Direction = 'up' | 'down';

type DiatonicMode = Exclude<Mode, 'chromatic'>;

const ascendingIntervals: Record<DiatonicMode, Interval[]> = {
  major: ['1P', '2M', '3M', '4P', '5P', '6M', '7M', '8P'],
  'natural-minor': ['1P', '2M', '3m', '4P', '5P', '6m', '7m', '8P'],
  'harmonic-minor': ['1P', '2M', '3m', '4P', '5P', '6m', '7M', '8P'],
  'melodic-minor': ['1P', '2M', '3m', '4P', '5P', '6M', '7M', '8P'],
};

const sharpNames = ['C', 'C#', 'D', 'D#', 'E', 'F', 'F#', 'G', 'G#', 'A', 'A#', 'B'];
const flatNames = ['C', 'Db', 'D', 'Eb', 'E', 'F', 'Gb', 'G', 'Ab', 'A', 'Bb', 'B'];

/**
 * One octave of a scale, both tonics included, as note names without octave:
 * scale({ tonic: 'B', mode: 'major' }) is B C# D# E F# G# A# B.
 *
 * Going down, the notes come in descending order. The melodic minor rises with a raised sixth
 * and seventh and falls as the natural minor, as theory textbooks teach it.
 *
 * The chromatic scale keeps its tonic as named at both ends and spells the other eleven notes
 * with sharps going up and flats going down, unless the major key on the tonic has flats in its
 * signature (F, Bb, Eb, Ab, Db, Gb, Cb), in which case it uses flats both ways.
 */
export function scale(key: Key, direction: Direction = 'up'): string[] {
  checkKey(key);
  if (direction !== 'up' && direction !== 'down') {
    throw new Error(`Unknown direction "${direction}": expected 'up' or 'down'.`);
  }
  if (key.mode === 'chromatic') {
    return chromaticScale(key, direction);
  }
  const mode: DiatonicMode =
    direction === 'down' && key.mode === 'melodic-minor' ? 'natural-minor' : key.mode;
  const notes = ascendingIntervals[mode].map((interval) => transposeNote(key.tonic, interval));
  return direction === 'up' ? notes : notes.reverse();
}

function chromaticScale(key: Key, direction: Direction): string[] {
  const useFlats = direction === 'down' || keySignature(key) < 0;
  const names = useFlats ? flatNames : sharpNames;
  const tonicClass = pitchClass(key.tonic);
  const notes = Array.from({ length: 13 }, (_, index) => {
    const offset = direction === 'up' ? index : -index;
    const pitch = (((tonicClass + offset) % 12) + 12) % 12;
    return pitch === tonicClass ? key.tonic : names[pitch];
  });
  return notes;
}

/**
 * The arpeggio of a key: scale degrees 1, 3, 5 and 8 (B major: B D# F# B). A chromatic scale
 * has no triad of its own, so it takes the major arpeggio on its tonic (common practice, no
 * source).
 */
export function arpeggio(key: Key): string[] {
  checkKey(key);
  const diatonic = key.mode === 'chromatic' ? { tonic: key.tonic, mode: 'major' as const } : key;
  const notes = scale(diatonic, 'up');
  return [notes[0], notes[2], notes[4], notes[7]];
}
