import { Key as TonalKey } from 'tonal';
import { describe, expect, it } from 'vitest';
import {
  checkKey,
  keyName,
  keySignature,
  majorTonics,
  minorTonics,
  type Key,
  type Mode,
} from './keys';

// Kostka & Payne, Tonal Harmony: major keys by number of sharps (index) and of flats.
const majorsBySharps = ['C', 'G', 'D', 'A', 'E', 'B', 'F#', 'C#'];
const majorsByFlats = ['C', 'F', 'Bb', 'Eb', 'Ab', 'Db', 'Gb', 'Cb'];
// Kostka & Payne, Tonal Harmony: their relative minors, in the same order.
const minorsBySharps = ['A', 'E', 'B', 'F#', 'C#', 'G#', 'D#', 'A#'];
const minorsByFlats = ['A', 'D', 'G', 'C', 'F', 'Bb', 'Eb', 'Ab'];

function textbookSignature(tonic: string, bySharps: string[], byFlats: string[]): number {
  return bySharps.includes(tonic) ? bySharps.indexOf(tonic) : -byFlats.indexOf(tonic);
}

describe('keySignature', () => {
  it('should match the textbook table when the key is any of the 15 major keys', () => {
    for (const tonic of majorTonics) {
      // Kostka & Payne, Tonal Harmony, table of major key signatures.
      expect(keySignature({ tonic, mode: 'major' })).toBe(
        textbookSignature(tonic, majorsBySharps, majorsByFlats),
      );
      // tonal (npm) Key.majorKey(tonic).alteration.
      expect(keySignature({ tonic, mode: 'major' })).toBe(TonalKey.majorKey(tonic).alteration);
    }
  });

  it('should match the textbook table when the key is any of the 15 minor keys in every form', () => {
    const minorModes: Mode[] = ['natural-minor', 'harmonic-minor', 'melodic-minor'];
    for (const tonic of minorTonics) {
      for (const mode of minorModes) {
        // Kostka & Payne, Tonal Harmony, table of minor key signatures.
        expect(keySignature({ tonic, mode })).toBe(
          textbookSignature(tonic, minorsBySharps, minorsByFlats),
        );
        // tonal (npm) Key.minorKey(tonic).alteration.
        expect(keySignature({ tonic, mode })).toBe(TonalKey.minorKey(tonic).alteration);
      }
    }
  });

  it('should use the major signature of the tonic when the scale is chromatic', () => {
    expect(keySignature({ tonic: 'Eb', mode: 'chromatic' })).toBe(-3);
    expect(keySignature({ tonic: 'A', mode: 'chromatic' })).toBe(3);
  });

  it('should count past seven when the key is theoretical', () => {
    // Common practice, no source: G# major would need eight sharps (F## among them).
    expect(keySignature({ tonic: 'G#', mode: 'major' })).toBe(8);
  });

  it('should reject a key when its tonic or mode is unknown', () => {
    expect(() => keySignature({ tonic: 'H', mode: 'major' })).toThrow(/Unknown tonic "H"/);
    expect(() => keySignature({ tonic: 'C###', mode: 'major' })).toThrow(/Unknown tonic/);
    expect(() => keySignature({ tonic: 'c', mode: 'major' })).toThrow(/Unknown tonic/);
    expect(() => keySignature({ tonic: 'C', mode: 'dorian' as Mode })).toThrow(
      /Unknown mode "dorian"/,
    );
  });
});

describe('majorTonics', () => {
  it('should hold the fifteen major keys when compared with the textbook table', () => {
    // Kostka & Payne, Tonal Harmony: 15 major key signatures, C plus 7 sharp and 7 flat keys.
    expect(new Set(majorTonics)).toEqual(new Set([...majorsBySharps, ...majorsByFlats]));
    // Kostka & Payne, Tonal Harmony: the 15 relative minors.
    expect(new Set(minorTonics)).toEqual(new Set([...minorsBySharps, ...minorsByFlats]));
    expect([majorTonics.length, minorTonics.length]).toEqual([15, 15]);
  });
});

describe('checkKey', () => {
  it('should return the key when it is well formed', () => {
    const key: Key = { tonic: 'Bb', mode: 'melodic-minor' };
    expect(checkKey(key)).toBe(key);
  });
});

describe('keyName', () => {
  it('should name the mode in words when the key is a harmonic minor', () => {
    expect(keyName({ tonic: 'F#', mode: 'harmonic-minor' })).toBe('F# harmonic minor');
  });
});
