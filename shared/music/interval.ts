import { formatNote, letters, letterStep, parseNote, semitonesAboveC } from './pitch';

/**
 * An interval in the shorthand of number then quality, with a leading '-' when it goes down:
 * '1P' unison, '-2M' a major second down, '-9M' a major ninth down, '15P' two octaves up.
 * Qualities: P perfect, M major, m minor, A augmented, d diminished. This is the spelling the
 * `tonal` library uses, so one string serves both.
 */
export type Interval = `${'' | '-'}${number}${'P' | 'M' | 'm' | 'A' | 'd'}`;

/** How far an interval moves: letter steps (diatonic) and semitones (chromatic), both signed. */
export interface IntervalSize {
  diatonicSteps: number;
  semitones: number;
}

const intervalPattern = /^(-?)(\d+)([PMmAd])$/;
const majorScaleSemitones = [0, 2, 4, 5, 7, 9, 11];
const perfectSteps = new Set([0, 3, 4]);

/** The diatonic and chromatic size of an interval ('-2M' → 1 step and 2 semitones down). */
export function intervalSize(interval: Interval): IntervalSize {
  const match = intervalPattern.exec(interval);
  const number = match ? Number(match[2]) : 0;
  if (!match || number < 1) {
    throw new Error(`Unknown interval "${interval}": expected e.g. '1P', '-2M', '-9M' or '15P'.`);
  }
  const [, sign, , quality] = match;
  const step = (number - 1) % 7;
  const octaves = Math.floor((number - 1) / 7);
  const perfect = perfectSteps.has(step);
  if (perfect ? quality === 'M' || quality === 'm' : quality === 'P') {
    throw new Error(`Unknown interval "${interval}": a ${number} cannot be ${quality}.`);
  }
  const qualityOffset: Record<string, number> = perfect
    ? { P: 0, A: 1, d: -1 }
    : { M: 0, m: -1, A: 1, d: -2 };
  const direction = sign === '-' ? -1 : 1;
  const diatonicSteps = direction * (step + 7 * octaves);
  const semitones = direction * (majorScaleSemitones[step] + qualityOffset[quality] + 12 * octaves);
  // Avoid -0 so that sizes compare equal with toEqual.
  return { diatonicSteps: diatonicSteps || 0, semitones: semitones || 0 };
}

/**
 * Moves a note by a number of letter steps and semitones, keeping the spelling the interval
 * implies (Bb3 up a major second is C4, not B#3). Works with or without an octave.
 */
export function transposeBySize(note: string, size: IntervalSize): string {
  const pitch = parseNote(note);
  const octave = pitch.octave ?? 4;
  const fromStep = letterStep(pitch.letter) + 7 * octave;
  const toStep = fromStep + size.diatonicSteps;
  const toOctave = Math.floor(toStep / 7);
  const toLetter = letters[toStep - 7 * toOctave];
  const fromSemitones = semitonesAboveC(pitch) + 12 * octave;
  const naturalTarget = semitonesAboveC({ letter: toLetter, alteration: 0 }) + 12 * toOctave;
  const alteration = fromSemitones + size.semitones - naturalTarget;
  return formatNote({
    letter: toLetter,
    alteration,
    ...(pitch.octave === undefined ? {} : { octave: toOctave }),
  });
}

/** Moves a note by an interval ('Bb3' up '2M' is 'C4'). */
export function transposeNote(note: string, interval: Interval): string {
  return transposeBySize(note, intervalSize(interval));
}

/** The same interval in the other direction. */
export function reverseSize(size: IntervalSize): IntervalSize {
  return { diatonicSteps: -size.diatonicSteps || 0, semitones: -size.semitones || 0 };
}
