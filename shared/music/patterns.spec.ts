import { Note } from 'tonal';
import { describe, expect, it } from 'vitest';
import { instruments, type NoteRange } from './instrument-data';
import type { Key } from './keys';
import { patternIds } from './pattern-shapes';
import { durationSeconds, pattern, PatternRangeError, type PatternNote } from './patterns';
import { midi, parseNote } from './pitch';
import { scale } from './scales';

const twelveMajorTonics = ['C', 'Db', 'D', 'Eb', 'E', 'F', 'Gb', 'G', 'Ab', 'A', 'Bb', 'B'];
const bMajor: Key = { tonic: 'B', mode: 'major' };
const bFlatMajor: Key = { tonic: 'Bb', mode: 'major' };

const names = (notes: PatternNote[]) => notes.map(({ note }) => note);
const octaves = (notes: PatternNote[]) => notes.map(({ note }) => parseNote(note).octave as number);
const inside = (notes: PatternNote[], range: NoteRange, shift = 0) =>
  notes.every(
    ({ note }) =>
      midi(note) + shift >= midi(range.lowest) && midi(note) + shift <= midi(range.highest),
  );

describe('pattern', () => {
  it('should play the scale up and down in whole notes without repeating the top when long tones', () => {
    const notes = pattern('long-tones', bMajor);
    expect(names(notes).join(' ')).toBe('B4 C#5 D#5 E5 F#5 G#5 A#5 B5 A#5 G#5 F#5 E5 D#5 C#5 B4');
    expect(notes.every(({ beats }) => beats === 4)).toBe(true);
  });

  it('should play the arpeggio up and down in whole notes when arpeggio-long', () => {
    // Common practice, no source: the arpeggio of concert B major is B D# F# B.
    expect(names(pattern('arpeggio-long', bMajor)).join(' ')).toBe('B4 D#5 F#5 B5 F#5 D#5 B4');
  });

  it('should share the tonic between scale and arpeggio and hold the last tonic when cycle-broad', () => {
    const notes = pattern('cycle-broad', bFlatMajor, { instrument: 'clarinet', pitch: 'written' });
    // Common practice, no source: the cycle is one line, the tonic where the scale comes down
    // starting the arpeggio (concert B major: B C# D# E F# G# A# B A# G# F# E D# C# B D# F# B F# D# B).
    expect(names(notes).join(' ')).toBe(
      'C4 D4 E4 F4 G4 A4 B4 C5 B4 A4 G4 F4 E4 D4 C4 E4 G4 C5 G4 E4 C4',
    );
    expect(notes.map(({ beats }) => beats)).toEqual([
      2, 1, 1, 1, 1, 1, 1, 2, 1, 1, 1, 1, 1, 1, 2, 1, 1, 2, 1, 1, 4,
    ]);
    // Seven 4/4 measures: 24 beats and the last tonic held as a whole note.
    expect(notes.reduce((total, { beats }) => total + beats, 0)).toBe(28);
  });

  it('should play the brisk cycle in quarters and eighths that end on the beat when cycle-brisk', () => {
    const broad = pattern('cycle-broad', bMajor);
    const brisk = pattern('cycle-brisk', bMajor);
    expect(names(brisk)).toEqual(names(broad));
    expect(brisk.map(({ beats }) => beats)).toEqual([
      1, 0.5, 0.5, 0.5, 0.5, 0.5, 0.5, 1, 0.5, 0.5, 0.5, 0.5, 0.5, 0.5, 1, 0.5, 0.5, 1, 0.5, 0.5, 4,
    ]);
  });

  it('should climb two octaves when octaves is 2', () => {
    const notes = pattern(
      'long-tones',
      { tonic: 'G', mode: 'major' },
      { instrument: 'violin', octaves: 2 },
    );
    expect(notes).toHaveLength(29);
    expect([notes[0].note, notes[14].note, notes[28].note]).toEqual(['G3', 'G5', 'G3']);
    const arpeggio = pattern(
      'arpeggio-long',
      { tonic: 'G', mode: 'major' },
      { instrument: 'violin', octaves: 2 },
    );
    expect(names(arpeggio).join(' ')).toBe('G3 B3 D4 G4 B4 D5 G5 D5 B4 G4 D4 B3 G3');
  });

  it('should rise as melodic minor and fall as natural minor when the mode is melodic minor', () => {
    const notes = pattern(
      'long-tones',
      { tonic: 'A', mode: 'melodic-minor' },
      { instrument: 'violin' },
    );
    expect(names(notes).join(' ')).toBe('A3 B3 C4 D4 E4 F#4 G#4 A4 G4 F4 E4 D4 C4 B3 A3');
  });

  it('should give the notes of the concert scale when pitch is concert', () => {
    for (const id of ['flute', 'clarinet', 'alto-sax', 'horn', 'tuba', 'glockenspiel']) {
      const notes = pattern('long-tones', bMajor, { instrument: id });
      // Common practice, no source: concert B major is B C# D# E F# G# A# B.
      expect(notes.slice(0, 8).map(({ note }) => Note.pitchClass(note))).toEqual(scale(bMajor));
    }
  });

  it('should sound the written placement when pitch is concert on a transposing instrument', () => {
    for (const instrument of instruments) {
      const written = pattern('cycle-broad', bMajor, {
        instrument: instrument.id,
        pitch: 'written',
      });
      const concert = pattern('cycle-broad', bMajor, { instrument: instrument.id });
      // tonal (npm) Note.transpose by the handbook interval, compared as MIDI numbers because
      // the written key is respelled (Db major for concert B major on Bb instruments).
      const sounding = written.map(({ note }) =>
        Note.midi(Note.transpose(note, instrument.transposition)),
      );
      expect(
        concert.map(({ note }) => midi(note)),
        instrument.id,
      ).toEqual(sounding);
    }
  });

  it('should write the respelled key when concert B major is written for the clarinet', () => {
    // Common practice, no source: concert B major is written Db major for Bb instruments.
    const notes = pattern('long-tones', bMajor, { instrument: 'clarinet', pitch: 'written' });
    expect(names(notes).slice(0, 8).join(' ')).toBe('Db4 Eb4 F4 Gb4 Ab4 Bb4 C5 Db5');
  });

  it('should place the tuba low when concert Bb major is asked at concert pitch', () => {
    const notes = pattern('cycle-broad', bFlatMajor, { instrument: 'tuba' });
    // Common practice, no source: a tuba's concert Bb scale lies in octaves 1 and 2 (Bb1–Bb2).
    expect(octaves(notes).every((octave) => octave >= 1 && octave <= 2)).toBe(true);
    expect(notes[0].note).toBe('Bb1');
  });

  it('should keep the flute in octaves 4 to 6 when any major key is asked', () => {
    for (const tonic of twelveMajorTonics) {
      for (const id of patternIds) {
        for (const count of [1, 2] as const) {
          const notes = pattern(id, { tonic, mode: 'major' }, { octaves: count });
          // Adler, The Study of Orchestration (from memory): the flute sounds C4–C7.
          expect(
            octaves(notes).every((octave) => octave >= 4 && octave <= 6),
            tonic,
          ).toBe(true);
        }
      }
    }
  });

  it('should keep every note in range at the lowest comfortable octave when any instrument plays any major key', () => {
    for (const instrument of instruments) {
      for (const tonic of twelveMajorTonics) {
        for (const id of patternIds) {
          for (const count of [1, 2] as const) {
            const label = `${instrument.id} ${tonic} ${id} ${count}`;
            let notes: PatternNote[];
            try {
              notes = pattern(
                id,
                { tonic, mode: 'major' },
                { instrument: instrument.id, octaves: count, pitch: 'written' },
              );
            } catch (error) {
              expect(error, label).toBeInstanceOf(PatternRangeError);
              expect(count, `${label}: one octave always fits`).toBe(2);
              continue;
            }
            expect(inside(notes, instrument.range), label).toBe(true);
            const inBeginner = inside(notes, instrument.beginnerRange);
            const lower = [-12, -24].some(
              (shift) =>
                inside(notes, instrument.range, shift) &&
                (!inBeginner || inside(notes, instrument.beginnerRange, shift)),
            );
            expect(lower, `${label}: a lower octave would fit as well`).toBe(false);
            if (!inBeginner) {
              const beginnerFit = [12, 24].some((shift) =>
                inside(notes, instrument.beginnerRange, shift),
              );
              expect(
                beginnerFit,
                `${label}: an octave inside the beginner range was passed over`,
              ).toBe(false);
            }
          }
        }
      }
    }
  }, 30_000);

  it('should throw a PatternRangeError when no octave fits the range', () => {
    const forced = () =>
      pattern(
        'long-tones',
        { tonic: 'F#', mode: 'major' },
        { instrument: 'glockenspiel', octaves: 2 },
      );
    expect(forced).toThrow(PatternRangeError);
    expect(forced).toThrow(/No octave of the long-tones pattern .* fits the Glockenspiel range/);
  });

  it('should tongue every note when the articulation is tongued', () => {
    expect(pattern('cycle-broad', bMajor).some(({ slurred }) => slurred)).toBe(false);
  });

  it('should tongue only the turning note of each run when the articulation is slurred', () => {
    const notes = pattern('cycle-broad', bMajor, { articulation: 'slurred' });
    const tongued = notes.flatMap(({ slurred }, index) => (slurred ? [] : [index]));
    // Runs: scale up (0–6), from the top down (7–13), arpeggio up from the shared tonic (14–16),
    // from its top down to the last tonic (17–20).
    expect(tongued).toEqual([0, 7, 14, 17]);
  });

  it('should slur every falling note to the note before when tongue up, slur down', () => {
    const notes = pattern('long-tones', bMajor, { articulation: 'tongue-up-slur-down' });
    expect(notes.map(({ slurred }) => slurred)).toEqual([
      ...Array(8).fill(false),
      ...Array(7).fill(true),
    ]);
    const cycle = pattern('cycle-broad', bMajor, { articulation: 'tongue-up-slur-down' });
    for (let index = 1; index < cycle.length; index += 1) {
      const falling = midi(cycle[index].note) < midi(cycle[index - 1].note);
      // Common practice, no source: tongue every rising note, slur every falling one.
      expect(cycle[index].slurred).toBe(falling);
    }
  });

  it('should throw when an option is unknown', () => {
    expect(() => pattern('long-tones', bMajor, { instrument: 'kazoo' })).toThrow(
      /Unknown instrument/,
    );
    expect(() => pattern('scales' as 'long-tones', bMajor)).toThrow(/Unknown pattern/);
    expect(() => pattern('long-tones', bMajor, { octaves: 3 as 1 })).toThrow(/1 or 2 octaves/);
  });
});

describe('durationSeconds', () => {
  it('should last 4 seconds when a whole note is played at quarter = 60', () => {
    // Common practice, no source: a whole note at quarter = 60 lasts four seconds.
    expect(durationSeconds([{ note: 'C4', beats: 4, slurred: false }], 60)).toBe(4);
  });

  it('should sum every note when a pattern is timed', () => {
    expect(durationSeconds(pattern('cycle-broad', bMajor), 120)).toBe(14);
    expect(() => durationSeconds([], 0)).toThrow(/positive/);
  });
});
