import { Note, Scale } from 'tonal';
import { describe, expect, it } from 'vitest';
import { majorTonics, minorTonics, type Mode } from './keys';
import { arpeggio, scale } from './scales';

const tonalModeNames: Record<Exclude<Mode, 'chromatic' | 'major'>, string> = {
  'natural-minor': 'minor',
  'harmonic-minor': 'harmonic minor',
  'melodic-minor': 'melodic minor',
};

/** tonal's scale notes with the upper tonic added, as our scales include both tonics. */
function tonalOctave(name: string): string[] {
  const notes = Scale.get(name).notes;
  return [...notes, notes[0]];
}

describe('scale', () => {
  it('should spell concert B major with five sharps when the key is B major', () => {
    // Common practice, no source: concert B major is B C# D# E F# G# A# B.
    expect(scale({ tonic: 'B', mode: 'major' })).toEqual([
      'B',
      'C#',
      'D#',
      'E',
      'F#',
      'G#',
      'A#',
      'B',
    ]);
  });

  it('should agree with tonal when the key is any of the 15 major keys', () => {
    for (const tonic of majorTonics) {
      // tonal (npm) Scale.get('<tonic> major').notes.
      expect(scale({ tonic, mode: 'major' })).toEqual(tonalOctave(`${tonic} major`));
    }
  });

  it('should agree with tonal when the key is any of the 15 minor keys in every minor form', () => {
    for (const tonic of minorTonics) {
      for (const [mode, tonalName] of Object.entries(tonalModeNames)) {
        // tonal (npm) Scale.get: 'minor', 'harmonic minor', 'melodic minor' (ascending form).
        expect(scale({ tonic, mode: mode as Mode })).toEqual(tonalOctave(`${tonic} ${tonalName}`));
      }
    }
  });

  it('should reverse the scale when the direction is down', () => {
    for (const tonic of majorTonics) {
      // tonal (npm) Scale.get, read backwards.
      expect(scale({ tonic, mode: 'major' }, 'down')).toEqual(
        tonalOctave(`${tonic} major`).reverse(),
      );
    }
    for (const tonic of minorTonics) {
      const harmonic = scale({ tonic, mode: 'harmonic-minor' }, 'down');
      // tonal (npm) Scale.get('<tonic> harmonic minor'), read backwards.
      expect(harmonic).toEqual(tonalOctave(`${tonic} harmonic minor`).reverse());
    }
  });

  it('should descend as the natural minor when the scale is melodic minor', () => {
    for (const tonic of minorTonics) {
      const melodic = scale({ tonic, mode: 'melodic-minor' }, 'down');
      // Kostka & Payne, Tonal Harmony: the melodic minor descends as the natural minor;
      // tonal (npm) gives only the ascending form, so the check uses tonal's natural minor.
      expect(melodic).toEqual(tonalOctave(`${tonic} minor`).reverse());
    }
    expect(scale({ tonic: 'A', mode: 'melodic-minor' })).toEqual([
      'A',
      'B',
      'C',
      'D',
      'E',
      'F#',
      'G#',
      'A',
    ]);
  });

  it('should hold all twelve pitch classes when the scale is chromatic', () => {
    const twelve = Scale.get('C chromatic').notes.map((note) => Note.chroma(note));
    for (const tonic of [...majorTonics, ...minorTonics]) {
      for (const direction of ['up', 'down'] as const) {
        const notes = scale({ tonic, mode: 'chromatic' }, direction);
        expect(notes).toHaveLength(13);
        expect([notes[0], notes[12]]).toEqual([tonic, tonic]);
        // tonal (npm) Scale.get('C chromatic'): the twelve pitch classes, compared by chroma.
        expect(new Set(notes.map((note) => Note.chroma(note)))).toEqual(new Set(twelve));
        const steps = notes
          .slice(1)
          .map((note, index) => Note.chroma(note) - Note.chroma(notes[index]));
        // Common practice, no source: a chromatic scale moves by a semitone each step.
        expect(steps.every((step) => (step + 12) % 12 === (direction === 'up' ? 1 : 11))).toBe(
          true,
        );
      }
    }
  });

  it('should use sharps up and flats down when the chromatic tonic is a sharp or natural key', () => {
    expect(scale({ tonic: 'D', mode: 'chromatic' }).join(' ')).toBe(
      'D D# E F F# G G# A A# B C C# D',
    );
    expect(scale({ tonic: 'D', mode: 'chromatic' }, 'down').join(' ')).toBe(
      'D Db C B Bb A Ab G Gb F E Eb D',
    );
  });

  it('should use flats both ways when the chromatic tonic is a flat key', () => {
    expect(scale({ tonic: 'Eb', mode: 'chromatic' }).join(' ')).toBe(
      'Eb E F Gb G Ab A Bb B C Db D Eb',
    );
    expect(scale({ tonic: 'Cb', mode: 'chromatic' }, 'down').join(' ')).toBe(
      'Cb Bb A Ab G Gb F E Eb D Db C Cb',
    );
  });

  it('should throw when the key or the direction is unknown', () => {
    expect(() => scale({ tonic: 'X', mode: 'major' })).toThrow(/Unknown tonic/);
    expect(() => scale({ tonic: 'C', mode: 'major' }, 'sideways' as 'up')).toThrow(/direction/);
  });
});

describe('arpeggio', () => {
  it('should give B D# F# B when the key is B major', () => {
    // Common practice, no source: the arpeggio of concert B major is B D# F# B.
    expect(arpeggio({ tonic: 'B', mode: 'major' })).toEqual(['B', 'D#', 'F#', 'B']);
  });

  it('should take degrees 1-3-5-8 of tonal scales when the key is any standard key', () => {
    for (const tonic of majorTonics) {
      const notes = Scale.get(`${tonic} major`).notes;
      // Common practice, no source: degrees 1-3-5-8; scale from tonal (npm) Scale.get.
      expect(arpeggio({ tonic, mode: 'major' })).toEqual([notes[0], notes[2], notes[4], notes[0]]);
    }
    for (const tonic of minorTonics) {
      const notes = Scale.get(`${tonic} harmonic minor`).notes;
      // Common practice, no source: degrees 1-3-5-8; scale from tonal (npm) Scale.get.
      expect(arpeggio({ tonic, mode: 'harmonic-minor' })).toEqual([
        notes[0],
        notes[2],
        notes[4],
        notes[0],
      ]);
    }
  });

  it('should use the major arpeggio of the tonic when the scale is chromatic', () => {
    expect(arpeggio({ tonic: 'F', mode: 'chromatic' })).toEqual(['F', 'A', 'C', 'F']);
  });
});
