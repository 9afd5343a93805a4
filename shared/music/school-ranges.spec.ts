import { describe, expect, it } from 'vitest';
import { instruments } from './instrument-data';
import { midi } from './pitch';
import {
  levelOfGrade,
  levelReach,
  patternForLevel,
  schoolLevels,
  schoolRange,
  schoolRanges,
} from './school-ranges';

const cMajor = { tonic: 'C', mode: 'major' } as const;
const contains = (outer: { lowest: string; highest: string }, inner: typeof outer) =>
  midi(outer.lowest) <= midi(inner.lowest) && midi(inner.highest) <= midi(outer.highest);

describe('school ranges', () => {
  it('should give every instrument nested ranges inside its written range', () => {
    for (const instrument of instruments) {
      const ranges = schoolRanges[instrument.id];
      expect(ranges, instrument.id).toBeDefined();
      // Common practice, no source: a player's range only grows from one school to the next,
      // and no school range goes past the range the sheets are drawn in.
      expect(contains(ranges.middle, ranges.elementary), instrument.id).toBe(true);
      expect(contains(ranges.high, ranges.middle), instrument.id).toBe(true);
      expect(contains(instrument.range, ranges.high), instrument.id).toBe(true);
    }
  });

  it('should say a requirement cannot fit the level when it needs notes beyond the school range', () => {
    // Adler, The Study of Orchestration (from memory): the piccolo is written to C7, a note
    // few school players have; two octaves of concert C need it.
    const piccolo = levelReach(
      { pattern: 'cycle-broad', key: cMajor, octaves: 2 },
      'piccolo',
      'high',
    );
    expect(piccolo.fits).toBe(false);
    expect(piccolo.fits ? '' : piccolo.message).toMatch(/^Cannot fit this level: .*written C7/);
    // Common practice, no source: two octaves of concert F on the horn reach written C6.
    const horn = levelReach(
      { pattern: 'cycle-broad', key: { tonic: 'F', mode: 'major' }, octaves: 2 },
      'horn',
      'high',
    );
    expect(horn.fits ? '' : horn.message).toMatch(/written C6/);
    // Common practice, no source: the double bass reaches written C5 only in thumb position.
    const bass = levelReach(
      { pattern: 'long-tones', key: { tonic: 'C', mode: 'major' }, octaves: 2 },
      'double-bass',
      'high',
    );
    expect(bass.fits ? '' : bass.message).toMatch(/Cannot fit this level/);
    // Common practice, no source: a tuba's two octaves of concert E would start on E1.
    const tuba = levelReach(
      { pattern: 'long-tones', key: { tonic: 'E', mode: 'major' }, octaves: 2 },
      'tuba',
      'middle',
    );
    expect(tuba.fits).toBe(false);
  });

  it('should place the pattern inside the level when some octave fits', () => {
    for (const level of schoolLevels) {
      const notes = patternForLevel(
        { pattern: 'cycle-broad', key: { tonic: 'Bb', mode: 'major' }, octaves: 1 },
        'clarinet',
        level,
      );
      expect(notes).not.toBeNull();
      const range = schoolRange('clarinet', level);
      for (const { note } of notes ?? []) {
        expect(midi(note)).toBeGreaterThanOrEqual(midi(range.lowest));
        expect(midi(note)).toBeLessThanOrEqual(midi(range.highest));
      }
    }
    const reach = levelReach(
      { pattern: 'cycle-broad', key: { tonic: 'Bb', mode: 'major' }, octaves: 1 },
      'clarinet',
      'elementary',
    );
    // Common practice, no source: concert Bb major is written C major for the Bb clarinet,
    // C4 to C5 below the break.
    expect(reach).toEqual({ level: 'elementary', fits: true, lowest: 'C4', highest: 'C5' });
  });

  it('should take the level from the grade', () => {
    // Common practice, no source: K–5 elementary, 6–8 middle, 9–12 high school.
    expect([0, 5, 6, 8, 9, 12].map(levelOfGrade)).toEqual([
      'elementary',
      'elementary',
      'middle',
      'middle',
      'high',
      'high',
    ]);
  });
});
