import type { Interval } from './interval';

/** The sections of a school band and orchestra, in score order. */
export const instrumentFamilies = ['woodwind', 'brass', 'percussion', 'strings'] as const;
export type InstrumentFamily = (typeof instrumentFamilies)[number];

/** A range of written notes, lowest and highest included. */
export interface NoteRange {
  lowest: string;
  highest: string;
}

/** What the music engine knows of one instrument. */
export interface InstrumentSpec {
  id: string;
  name: string;
  family: InstrumentFamily;
  clef: 'treble' | 'bass' | 'alto';
  /** The interval from the written note to the sounding note ('-2M': sounds a major 2nd lower). */
  transposition: Interval;
  /** The written range a school player can be asked to play; patterns are placed inside it. */
  range: NoteRange;
  /** The written range most comfortable in the first years of playing. */
  beginnerRange: NoteRange;
}

/*
 * Sources.
 * Transpositions: Samuel Adler, The Study of Orchestration (3rd ed., 2002), from memory and
 * consistent with every orchestration handbook.
 * `range`: the written practical range of a good high-school player, narrowed from the
 * professional ranges in Adler's instrument charts (from memory); where the school range is a
 * teacher's judgement it is marked "common practice, no source".
 * `beginnerRange`: the written range of the first two or three years (common practice, no
 * source).
 */
/** Every instrument the ladder and the practice sheets know, in score order. */
export const instruments: InstrumentSpec[] = [
  // Adler: piccolo written D4–C7, sounds an octave higher (from memory).
  {
    id: 'piccolo',
    name: 'Piccolo',
    family: 'woodwind',
    clef: 'treble',
    transposition: '8P',
    range: { lowest: 'D4', highest: 'C7' },
    beginnerRange: { lowest: 'D4', highest: 'A6' },
  },
  // Adler: flute C4–C7, B3 with a B foot (from memory).
  {
    id: 'flute',
    name: 'Flute',
    family: 'woodwind',
    clef: 'treble',
    transposition: '1P',
    range: { lowest: 'C4', highest: 'C7' },
    beginnerRange: { lowest: 'C4', highest: 'C6' },
  },
  // Adler: oboe Bb3–A6 (from memory); top narrowed to F6 (common practice, no source).
  {
    id: 'oboe',
    name: 'Oboe',
    family: 'woodwind',
    clef: 'treble',
    transposition: '1P',
    range: { lowest: 'Bb3', highest: 'F6' },
    beginnerRange: { lowest: 'C4', highest: 'C6' },
  },
  // Adler: bassoon Bb1–E5 (from memory); top narrowed to D5 (common practice, no source).
  {
    id: 'bassoon',
    name: 'Bassoon',
    family: 'woodwind',
    clef: 'bass',
    transposition: '1P',
    range: { lowest: 'Bb1', highest: 'D5' },
    beginnerRange: { lowest: 'C2', highest: 'G4' },
  },
  // Adler: Bb clarinet written E3–C7 (from memory); top narrowed to G6 (common practice).
  {
    id: 'clarinet',
    name: 'Clarinet',
    family: 'woodwind',
    clef: 'treble',
    transposition: '-2M',
    range: { lowest: 'E3', highest: 'G6' },
    beginnerRange: { lowest: 'E3', highest: 'C6' },
  },
  // Adler: bass clarinet written Eb3 (C3 on long models) upward, treble clef (from memory);
  // top E6 is common practice, no source.
  {
    id: 'bass-clarinet',
    name: 'Bass Clarinet',
    family: 'woodwind',
    clef: 'treble',
    transposition: '-9M',
    range: { lowest: 'Eb3', highest: 'E6' },
    beginnerRange: { lowest: 'E3', highest: 'C5' },
  },
  // Adler: every saxophone is written Bb3–F6 (from memory).
  {
    id: 'soprano-sax',
    name: 'Soprano Saxophone',
    family: 'woodwind',
    clef: 'treble',
    transposition: '-2M',
    range: { lowest: 'Bb3', highest: 'F6' },
    beginnerRange: { lowest: 'C4', highest: 'C6' },
  },
  {
    id: 'alto-sax',
    name: 'Alto Saxophone',
    family: 'woodwind',
    clef: 'treble',
    transposition: '-6M',
    range: { lowest: 'Bb3', highest: 'F6' },
    beginnerRange: { lowest: 'C4', highest: 'C6' },
  },
  {
    id: 'tenor-sax',
    name: 'Tenor Saxophone',
    family: 'woodwind',
    clef: 'treble',
    transposition: '-9M',
    range: { lowest: 'Bb3', highest: 'F6' },
    beginnerRange: { lowest: 'C4', highest: 'C6' },
  },
  {
    id: 'bari-sax',
    name: 'Baritone Saxophone',
    family: 'woodwind',
    clef: 'treble',
    transposition: '-13M',
    range: { lowest: 'Bb3', highest: 'F6' },
    beginnerRange: { lowest: 'C4', highest: 'C6' },
  },
  // Adler: Bb trumpet written F#3–D6 (from memory); top narrowed to C6 (common practice).
  {
    id: 'trumpet',
    name: 'Trumpet',
    family: 'brass',
    clef: 'treble',
    transposition: '-2M',
    range: { lowest: 'F#3', highest: 'C6' },
    beginnerRange: { lowest: 'C4', highest: 'G5' },
  },
  // Horn in F: Adler's written range reaches far lower in bass clef (from memory); the school
  // range in treble clef is common practice, no source.
  {
    id: 'horn',
    name: 'French Horn',
    family: 'brass',
    clef: 'treble',
    transposition: '-5P',
    range: { lowest: 'F#3', highest: 'C6' },
    beginnerRange: { lowest: 'G3', highest: 'F5' },
  },
  // Adler: tenor trombone E2–F5 without the pedal notes (from memory).
  {
    id: 'trombone',
    name: 'Trombone',
    family: 'brass',
    clef: 'bass',
    transposition: '1P',
    range: { lowest: 'E2', highest: 'F5' },
    beginnerRange: { lowest: 'F2', highest: 'F4' },
  },
  // Euphonium: three-valve range like the tenor trombone's (common practice, no source).
  {
    id: 'euphonium',
    name: 'Euphonium',
    family: 'brass',
    clef: 'bass',
    transposition: '1P',
    range: { lowest: 'E2', highest: 'F5' },
    beginnerRange: { lowest: 'F2', highest: 'F4' },
  },
  // The treble-clef part is the bass-clef range written a major 9th higher.
  {
    id: 'euphonium-tc',
    name: 'Euphonium (treble clef)',
    family: 'brass',
    clef: 'treble',
    transposition: '-9M',
    range: { lowest: 'F#3', highest: 'G6' },
    beginnerRange: { lowest: 'G3', highest: 'G5' },
  },
  // Adler: tuba D1–F4 (from memory); lowest raised to E1, the three-valve limit.
  {
    id: 'tuba',
    name: 'Tuba',
    family: 'brass',
    clef: 'bass',
    transposition: '1P',
    range: { lowest: 'E1', highest: 'F4' },
    beginnerRange: { lowest: 'Bb1', highest: 'Bb3' },
  },
  // Adler: glockenspiel written G3–C6, sounds two octaves higher (from memory).
  {
    id: 'glockenspiel',
    name: 'Glockenspiel',
    family: 'percussion',
    clef: 'treble',
    transposition: '15P',
    range: { lowest: 'G3', highest: 'C6' },
    beginnerRange: { lowest: 'G3', highest: 'C6' },
  },
  // Adler: xylophone written F3–C7, sounds an octave higher (from memory).
  {
    id: 'xylophone',
    name: 'Xylophone',
    family: 'percussion',
    clef: 'treble',
    transposition: '8P',
    range: { lowest: 'F3', highest: 'C7' },
    beginnerRange: { lowest: 'C4', highest: 'C6' },
  },
  // A four-octave school marimba, C3–C7 (common practice, no source).
  {
    id: 'marimba',
    name: 'Marimba',
    family: 'percussion',
    clef: 'treble',
    transposition: '1P',
    range: { lowest: 'C3', highest: 'C7' },
    beginnerRange: { lowest: 'C4', highest: 'C6' },
  },
  // Adler: violin from G3 (from memory); the school top A6 and first position to B5 are
  // common practice, no source.
  {
    id: 'violin',
    name: 'Violin',
    family: 'strings',
    clef: 'treble',
    transposition: '1P',
    range: { lowest: 'G3', highest: 'A6' },
    beginnerRange: { lowest: 'G3', highest: 'B5' },
  },
  // Adler: viola from C3 (from memory); top D6 and first position to E5 are common practice.
  {
    id: 'viola',
    name: 'Viola',
    family: 'strings',
    clef: 'alto',
    transposition: '1P',
    range: { lowest: 'C3', highest: 'D6' },
    beginnerRange: { lowest: 'C3', highest: 'E5' },
  },
  // Adler: cello from C2 (from memory); top C5 and first position to D4 are common practice.
  {
    id: 'cello',
    name: 'Cello',
    family: 'strings',
    clef: 'bass',
    transposition: '1P',
    range: { lowest: 'C2', highest: 'C5' },
    beginnerRange: { lowest: 'C2', highest: 'D4' },
  },
  // Adler: double bass written E2 (sounding E1), an octave above its sound (from memory); the
  // school top C5 and first positions to D4 are common practice, no source.
  {
    id: 'double-bass',
    name: 'Double Bass',
    family: 'strings',
    clef: 'bass',
    transposition: '-8P',
    range: { lowest: 'E2', highest: 'C5' },
    beginnerRange: { lowest: 'E2', highest: 'D4' },
  },
];
