import { parseNote, type Letter } from './pitch';

/** The kinds of scale a requirement can ask for, in the order a ladder usually meets them. */
export const modes = [
  'major',
  'natural-minor',
  'harmonic-minor',
  'melodic-minor',
  'chromatic',
] as const;
export type Mode = (typeof modes)[number];

/** A key: its tonic (a letter with '#', '##', 'b' or 'bb') and its mode. */
export interface Key {
  tonic: string;
  mode: Mode;
}

/**
 * The line of fifths from Cb to A#: each note a perfect fifth above the one before it. A key
 * signature of n flats or sharps has its major tonic at place n + 7 (counting flats negative)
 * and its relative minor three fifths higher.
 */
const lineOfFifths = 'Cb Gb Db Ab Eb Bb F C G D A E B F# C# G# D# A#'.split(' ');

/** The tonics of the 15 major keys with a standard key signature, from 7 flats to 7 sharps. */
export const majorTonics: readonly string[] = lineOfFifths.slice(0, 15);

/** The tonics of the 15 minor keys with a standard key signature, from 7 flats to 7 sharps. */
export const minorTonics: readonly string[] = lineOfFifths.slice(3, 18);

/** Each letter's place on the circle of fifths counted from C (sharps positive). */
const letterFifths: Record<Letter, number> = { F: -1, C: 0, G: 1, D: 2, A: 3, E: 4, B: 5 };

const modeNames: Record<Mode, string> = {
  major: 'major',
  'natural-minor': 'natural minor',
  'harmonic-minor': 'harmonic minor',
  'melodic-minor': 'melodic minor',
  chromatic: 'chromatic',
};

/** Whether a mode is one of the three minor forms. */
export function isMinor(mode: Mode): boolean {
  return mode === 'natural-minor' || mode === 'harmonic-minor' || mode === 'melodic-minor';
}

/**
 * Checks a key and returns it; throws an Error that names the problem when the tonic is not a
 * letter A–G with an optional '#', '##', 'b' or 'bb', or the mode is unknown.
 */
export function checkKey(key: Key): Key {
  if (!key || typeof key.tonic !== 'string' || !/^[A-G](##|#|bb|b)?$/.test(key.tonic)) {
    throw new Error(
      `Unknown tonic "${key?.tonic}": expected a letter A–G with an optional #, ##, b or bb.`,
    );
  }
  if (!modes.includes(key.mode)) {
    throw new Error(`Unknown mode "${key.mode}": expected one of ${modes.join(', ')}.`);
  }
  return key;
}

/**
 * The key signature: the number of sharps (positive) or flats (negative). A minor key has the
 * signature of its relative major, three fifths lower on the circle. A chromatic scale has no
 * key signature of its own; it takes the signature of the major key on its tonic. Keys beyond
 * seven sharps or flats (G# major, Fb major) are theoretical and give 8 or more.
 */
export function keySignature(key: Key): number {
  checkKey(key);
  const tonic = parseNote(key.tonic);
  const majorSignature = letterFifths[tonic.letter] + 7 * tonic.alteration;
  return isMinor(key.mode) ? majorSignature - 3 : majorSignature;
}

/** Whether a key has one of the 15 standard signatures (seven sharps or flats at most). */
export function isStandardKey(key: Key): boolean {
  return Math.abs(keySignature(key)) <= 7;
}

/** A key's everyday name: 'Bb major', 'F# harmonic minor', 'C chromatic'. */
export function keyName(key: Key): string {
  checkKey(key);
  return `${key.tonic} ${modeNames[key.mode]}`;
}
