import { describe, expect, it } from 'vitest';
import { instrumentIds, instrumentNamedIn, resolveInstrument } from './instrument-names';

describe('resolveInstrument', () => {
  it('should give every instrument id back when the cell is the id itself', () => {
    for (const id of instrumentIds) {
      expect(resolveInstrument(id)).toBe(id);
      expect(resolveInstrument(id.toUpperCase())).toBe(id);
    }
  });

  // Usual names of the instruments (common practice, no source).
  it.each([
    ['Alto Saxophone', 'alto-sax'],
    ['Alto Sax', 'alto-sax'],
    ['alto sax', 'alto-sax'],
    ['French Horn', 'horn'],
    ['Horn in F', 'horn'],
    ['Bb Clarinet', 'clarinet'],
    ['B-flat Clarinet', 'clarinet'],
    ['B♭ Clarinet', 'clarinet'],
    ['B flat clarinet', 'clarinet'],
    ['Clarinet', 'clarinet'],
    ['Bass Clarinet', 'bass-clarinet'],
    ['Baritone Saxophone', 'bari-sax'],
    ['Bari Sax', 'bari-sax'],
    ['Tenor Sax', 'tenor-sax'],
    ['Soprano Saxophone', 'soprano-sax'],
    ['Trumpet', 'trumpet'],
    ['Cornet', 'trumpet'],
    ['Trombone', 'trombone'],
    ['Baritone', 'euphonium'],
    ['Baritone BC', 'euphonium'],
    ['Euphonium', 'euphonium'],
    ['Baritone TC', 'euphonium-tc'],
    ['Euphonium TC', 'euphonium-tc'],
    ['Tuba', 'tuba'],
    ['Sousaphone', 'tuba'],
    ['Percussion', 'glockenspiel'],
    ['Bells', 'glockenspiel'],
    ['Xylophone', 'xylophone'],
    ['Marimba', 'marimba'],
    ['Violin', 'violin'],
    ['Viola', 'viola'],
    ['Cello', 'cello'],
    ['Violoncello', 'cello'],
    ['String Bass', 'double-bass'],
    ['Double Bass', 'double-bass'],
    ['Upright Bass', 'double-bass'],
    ['Contrabass', 'double-bass'],
    ['  FLUTE ', 'flute'],
    ['Piccolo', 'piccolo'],
    ['Oboe', 'oboe'],
    ['Bassoon', 'bassoon'],
  ])('should resolve %j to %s when it is a usual name', (cell, id) => {
    expect(resolveInstrument(cell)).toBe(id);
  });

  it.each(['kazoo', '', '   ', 'Bass', 'Sax', 'Band', 'Piano'])(
    'should give null for %j when it names no instrument we know',
    (cell) => {
      expect(resolveInstrument(cell)).toBeNull();
    },
  );

  it('should give the same answer when a cell is asked for again', () => {
    expect(resolveInstrument('French Horn')).toBe('horn');
    expect(resolveInstrument('French Horn')).toBe('horn');
    expect(resolveInstrument('kazoo')).toBeNull();
    expect(resolveInstrument('kazoo')).toBeNull();
  });
});

describe('instrumentNamedIn', () => {
  it.each([
    ['Beginning Band - Clarinet', 'clarinet'],
    ['Violin 2', 'violin'],
    ['Alto Sax Sectional', 'alto-sax'],
    ['Baritone Saxophone Lessons', 'bari-sax'],
    ['Horn Choir', 'horn'],
    ['Music, Violin', 'violin'],
  ])('should find the instrument in %j (%s) when the text names exactly one', (text, id) => {
    expect(instrumentNamedIn(text)).toBe(id);
  });

  it.each([
    'Concert Band',
    'Jazz Band',
    'Percussion Ensemble',
    'Handbells',
    'Baritone Ensemble',
    'Orchestra - Violin/Viola',
    'Music',
    '',
  ])('should give null for %j when the text names no instrument or more than one', (text) => {
    expect(instrumentNamedIn(text)).toBeNull();
  });
});
