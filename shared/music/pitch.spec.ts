import fc from 'fast-check';
import { Note } from 'tonal';
import { describe, expect, it } from 'vitest';
import { frequency, midi, parseNote, pitchClass, spellAtMidi } from './pitch';

const spelledNote = fc
  .tuple(
    fc.constantFrom('C', 'D', 'E', 'F', 'G', 'A', 'B'),
    fc.constantFrom('', '#', '##', 'b', 'bb'),
    fc.integer({ min: 0, max: 8 }),
  )
  .map(([letter, accidental, octave]) => `${letter}${accidental}${octave}`);

describe('midi', () => {
  it('should give 60 when the note is middle C written C4', () => {
    // MIDI 1.0 Detailed Specification: note 60 is middle C; scientific pitch notation calls it C4.
    expect(midi('C4')).toBe(60);
  });

  it('should count enharmonic spellings by their letter octave when the note is B#3 or Cb4', () => {
    // Scientific pitch notation: the octave number belongs to the letter, so B#3 = C4 and Cb4 = B3.
    expect(midi('B#3')).toBe(60);
    // Scientific pitch notation, as above.
    expect(midi('Cb4')).toBe(59);
  });

  it('should span 0 to 127 when the notes are C-1 and G9', () => {
    // MIDI 1.0 Detailed Specification: note numbers run 0–127, C-1 to G9 with C4 = 60.
    expect([midi('C-1'), midi('G9')]).toEqual([0, 127]);
  });

  it('should agree with tonal when the note has any accidental', () => {
    fc.assert(
      fc.property(spelledNote, (note) => {
        // tonal (npm) Note.midi, an independent implementation of the same numbering.
        expect(midi(note)).toBe(Note.midi(note));
      }),
    );
  });

  it('should throw a clear error when the note has no octave or an unknown accidental', () => {
    expect(() => midi('C')).toThrow(/octave/);
    expect(() => midi('H4')).toThrow(/Unknown note/);
    expect(() => midi('C###4')).toThrow(/Unknown note/);
  });
});

describe('frequency', () => {
  it('should give 440 Hz when the note is A4', () => {
    // ISO 16:1975, Acoustics — Standard tuning frequency: A4 = 440 Hz.
    expect(frequency('A4')).toBe(440);
  });

  it('should follow equal temperament when the note is C4', () => {
    // Equal temperament from ISO 16's A4 = 440 Hz: f = 440 · 2^((60 − 69) / 12) ≈ 261.626 Hz.
    expect(frequency('C4')).toBeCloseTo(261.6256, 3);
  });

  it('should scale with the tuning when A4 is set to 442 Hz', () => {
    expect(frequency('A5', 442)).toBe(884);
  });

  it('should agree with tonal when the note has any accidental', () => {
    fc.assert(
      fc.property(spelledNote, (note) => {
        // tonal (npm) Note.freq, equal temperament at A4 = 440 Hz.
        expect(frequency(note)).toBeCloseTo(Note.freq(note) as number, 6);
      }),
    );
  });
});

describe('parseNote', () => {
  it('should read letter, alteration and octave when the note is Ebb3', () => {
    expect(parseNote('Ebb3')).toEqual({ letter: 'E', alteration: -2, octave: 3 });
  });

  it('should leave the octave out when the name has none', () => {
    expect(parseNote('F#')).toEqual({ letter: 'F', alteration: 1 });
  });
});

describe('pitchClass', () => {
  it('should wrap below C when the note is Cb', () => {
    expect(pitchClass('Cb')).toBe(11);
  });
});

describe('spellAtMidi', () => {
  it('should pick the octave of the letter when the name is an enharmonic spelling', () => {
    expect(spellAtMidi('Cb', 59)).toBe('Cb4');
    expect(spellAtMidi('B#', 60)).toBe('B#3');
  });

  it('should throw when the name is not a spelling of that pitch', () => {
    expect(() => spellAtMidi('D', 60)).toThrow(/not a spelling/);
  });
});
