import { Note } from 'tonal';
import { describe, expect, it } from 'vitest';
import { instrumentFamilies, instruments } from './instrument-data';
import { findInstrument, instrumentById, transpositionSize } from './instruments';
import { midi } from './pitch';
import { toConcert } from './transposition';

/**
 * Samuel Adler, The Study of Orchestration (3rd ed.): sounding pitch against written, from
 * memory and consistent with every orchestration handbook; clefs as school parts print them.
 */
const handbook: Record<string, { interval: string; clef: string; family: string }> = {
  piccolo: { interval: '8P', clef: 'treble', family: 'woodwind' },
  flute: { interval: '1P', clef: 'treble', family: 'woodwind' },
  oboe: { interval: '1P', clef: 'treble', family: 'woodwind' },
  bassoon: { interval: '1P', clef: 'bass', family: 'woodwind' },
  clarinet: { interval: '-2M', clef: 'treble', family: 'woodwind' },
  'bass-clarinet': { interval: '-9M', clef: 'treble', family: 'woodwind' },
  'alto-sax': { interval: '-6M', clef: 'treble', family: 'woodwind' },
  'tenor-sax': { interval: '-9M', clef: 'treble', family: 'woodwind' },
  'bari-sax': { interval: '-13M', clef: 'treble', family: 'woodwind' },
  'soprano-sax': { interval: '-2M', clef: 'treble', family: 'woodwind' },
  trumpet: { interval: '-2M', clef: 'treble', family: 'brass' },
  horn: { interval: '-5P', clef: 'treble', family: 'brass' },
  trombone: { interval: '1P', clef: 'bass', family: 'brass' },
  euphonium: { interval: '1P', clef: 'bass', family: 'brass' },
  'euphonium-tc': { interval: '-9M', clef: 'treble', family: 'brass' },
  tuba: { interval: '1P', clef: 'bass', family: 'brass' },
  glockenspiel: { interval: '15P', clef: 'treble', family: 'percussion' },
  xylophone: { interval: '8P', clef: 'treble', family: 'percussion' },
  marimba: { interval: '1P', clef: 'treble', family: 'percussion' },
  violin: { interval: '1P', clef: 'treble', family: 'strings' },
  viola: { interval: '1P', clef: 'alto', family: 'strings' },
  cello: { interval: '1P', clef: 'bass', family: 'strings' },
  'double-bass': { interval: '-8P', clef: 'bass', family: 'strings' },
};

const sampleNotes = ['C4', 'F#3', 'Bb4', 'Eb5', 'G#2', 'Cb4', 'E#4', 'A3', 'Db6', 'B2'];

describe('instruments', () => {
  it('should list every instrument id in score order when read', () => {
    expect(instruments.map(({ id }) => id).sort()).toEqual(Object.keys(handbook).sort());
  });

  it('should sound the handbook interval from the written note when transposed by tonal', () => {
    for (const instrument of instruments) {
      for (const written of sampleNotes) {
        // Adler, The Study of Orchestration (3rd ed.), interval from memory; tonal (npm) Note.transpose.
        expect(toConcert(written, instrument.id)).toBe(
          Note.transpose(written, handbook[instrument.id].interval),
        );
      }
    }
  });

  it('should use the clef and family of school parts when the instrument is read', () => {
    for (const instrument of instruments) {
      // Adler, The Study of Orchestration (3rd ed.), clefs from memory; common practice, no source.
      expect([instrument.clef, instrument.family]).toEqual([
        handbook[instrument.id].clef,
        handbook[instrument.id].family,
      ]);
      expect(instrumentFamilies).toContain(instrument.family);
    }
  });

  it('should keep the beginner range inside the range when any instrument is read', () => {
    for (const { range, beginnerRange, id } of instruments) {
      expect(midi(range.lowest), id).toBeLessThan(midi(range.highest));
      expect(midi(beginnerRange.lowest), id).toBeGreaterThanOrEqual(midi(range.lowest));
      expect(midi(beginnerRange.highest), id).toBeLessThanOrEqual(midi(range.highest));
      // Common practice, no source: a one-octave scale in every key needs 23 semitones or more.
      expect(midi(range.highest) - midi(range.lowest), id).toBeGreaterThanOrEqual(23);
    }
  });

  it('should start at the lowest written note of the handbook when the instrument has a fixed bottom', () => {
    // Adler, The Study of Orchestration (3rd ed.), from memory: lowest written notes.
    const lowest = {
      flute: 'C4',
      oboe: 'Bb3',
      bassoon: 'Bb1',
      clarinet: 'E3',
      'alto-sax': 'Bb3',
      violin: 'G3',
      viola: 'C3',
      cello: 'C2',
      'double-bass': 'E2',
    };
    for (const [id, note] of Object.entries(lowest)) {
      expect(instrumentById(id).range.lowest).toBe(note);
    }
  });
});

describe('instrumentById', () => {
  it('should throw a clear error when the id is unknown', () => {
    expect(() => instrumentById('kazoo')).toThrow(/Unknown instrument "kazoo"/);
  });
});

describe('findInstrument', () => {
  it('should find the instrument when given a usual name in any case', () => {
    const names: Record<string, string> = {
      'Alto Saxophone': 'alto-sax',
      'French Horn': 'horn',
      'Bb Clarinet': 'clarinet',
      'B-flat clarinet': 'clarinet',
      'Baritone Sax': 'bari-sax',
      'BARITONE SAXOPHONE': 'bari-sax',
      'String Bass': 'double-bass',
      'Euphonium TC': 'euphonium-tc',
      'euphonium treble clef': 'euphonium-tc',
      Baritone: 'euphonium',
      'Horn in F': 'horn',
      'tenor-sax': 'tenor-sax',
      'Eb Alto Sax': 'alto-sax',
      bells: 'glockenspiel',
      Violoncello: 'cello',
      Tuba: 'tuba',
    };
    for (const [name, id] of Object.entries(names)) {
      expect(findInstrument(name)?.id, name).toBe(id);
    }
  });

  it('should find every instrument by its own id and name', () => {
    for (const instrument of instruments) {
      expect(findInstrument(instrument.id)).toBe(instrument);
      expect(findInstrument(instrument.name)).toBe(instrument);
    }
  });

  it('should give undefined when the name is unknown', () => {
    expect(findInstrument('theremin')).toBeUndefined();
  });
});

describe('transpositionSize', () => {
  it('should give diatonic steps and semitones when the instrument is the Bb clarinet', () => {
    // Adler, The Study of Orchestration (3rd ed.): the Bb clarinet sounds a major 2nd lower.
    expect(transpositionSize('clarinet')).toEqual({ diatonicSteps: -1, semitones: -2 });
    // Adler: the Eb baritone saxophone sounds an octave and a major 6th lower.
    expect(transpositionSize('bari-sax')).toEqual({ diatonicSteps: -12, semitones: -21 });
  });
});
