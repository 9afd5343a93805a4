import fc from 'fast-check';
import { Interval as TonalInterval, Note } from 'tonal';
import { describe, expect, it } from 'vitest';
import { intervalSize, transposeNote, type Interval } from './interval';

const intervals: Interval[] = [
  '1P',
  '8P',
  '15P',
  '-8P',
  '-2M',
  '-9M',
  '-6M',
  '-13M',
  '-5P',
  '3m',
  '4A',
  '5d',
];

describe('intervalSize', () => {
  it('should give one step and two semitones down when the interval is -2M', () => {
    expect(intervalSize('-2M')).toEqual({ diatonicSteps: -1, semitones: -2 });
  });

  it('should count compound intervals when the interval is a major 13th down', () => {
    expect(intervalSize('-13M')).toEqual({ diatonicSteps: -12, semitones: -21 });
  });

  it('should agree with tonal when the interval is any of the instrument intervals', () => {
    for (const interval of intervals) {
      const size = intervalSize(interval);
      // tonal (npm) Interval.semitones, an independent interval parser.
      expect(size.semitones).toBe(TonalInterval.semitones(interval));
    }
  });

  it('should throw when the interval is not well formed', () => {
    expect(() => intervalSize('-M2' as Interval)).toThrow(/Unknown interval/);
    expect(() => intervalSize('3P' as Interval)).toThrow(/cannot be P/);
  });
});

describe('transposeNote', () => {
  it('should spell by the interval when Bb3 goes up a major second', () => {
    // Common practice, no source: a major second above Bb is C, never B#.
    expect(transposeNote('Bb3', '2M')).toBe('C4');
  });

  it('should keep a pitch without octave as a pitch class when no octave is given', () => {
    expect(transposeNote('C#', '2d')).toBe('Db');
  });

  it('should agree with tonal when the note has a single accidental', () => {
    const note = fc
      .tuple(
        fc.constantFrom('C', 'D', 'E', 'F', 'G', 'A', 'B'),
        fc.constantFrom('', '#', 'b'),
        fc.integer({ min: 1, max: 7 }),
      )
      .map(([letter, accidental, octave]) => `${letter}${accidental}${octave}`);
    fc.assert(
      fc.property(note, fc.constantFrom(...intervals), (written, interval) => {
        // tonal (npm) Note.transpose, an independent transposition by interval.
        expect(transposeNote(written, interval)).toBe(Note.transpose(written, interval));
      }),
    );
  });
});
