import { instrumentById, transpositionSize } from './instruments';
import type { InstrumentSpec } from './instrument-data';
import { layOutMeasures } from './measure-layout';
import type { PatternNote, PatternPitch } from './patterns';
import { midi } from './pitch';

/** A clef as a sheet shows it. */
export interface StaffClef {
  clef: InstrumentSpec['clef'];
  /**
   * Octaves the music sounds above where the staff shows it: 1 for the treble clef with an 8
   * above it, 2 with a 15, -1 for a clef with an 8 below it; 0 for a plain clef.
   */
  octaveChange: number;
}

/** The lowest note a marimba part shows in treble clef before it turns to bass clef. */
const marimbaTrebleFloor = 'G3';

/**
 * The clef of every measure of a sheet (one entry per measure of `layOutMeasures(notes)`):
 *
 * - A written sheet reads in the instrument's clef.
 * - A concert sheet of an instrument that transposes by whole octaves (piccolo and xylophone
 *   an octave up, glockenspiel two, double bass one down) keeps the notes where the player reads
 *   them and marks the octave on the clef (treble with 8 or 15 above, bass with 8 below), as
 *   orchestral scores show these instruments (Adler, The Study of Orchestration, from memory).
 * - A concert sheet of any other transposing instrument reads in treble clef when the pattern
 *   sounds mostly from middle C up and in bass clef below it (a tenor or baritone saxophone's
 *   concert part reads best in bass clef); the viola keeps its alto clef.
 * - The marimba reads treble clef, turning to bass clef for a measure that goes below G3 so its
 *   low notes do not hang on ledger lines (common practice, no source: marimba parts move
 *   between the clefs of a grand staff).
 */
export function sheetClefs(
  instrumentId: string,
  notes: PatternNote[],
  pitch: PatternPitch,
): StaffClef[] {
  const instrument = instrumentById(instrumentId);
  const measures = layOutMeasures(notes);
  const size = transpositionSize(instrument.id);
  if (instrument.id === 'marimba') {
    return measures.map((pieces) => {
      const low = pieces.some(({ note }) => note !== null && midi(note) < midi(marimbaTrebleFloor));
      return { clef: low ? 'bass' : 'treble', octaveChange: 0 };
    });
  }
  let clef: StaffClef = { clef: instrument.clef, octaveChange: 0 };
  if (pitch === 'concert' && size.semitones !== 0 && instrument.clef !== 'alto') {
    if (size.semitones % 12 === 0 && size.diatonicSteps % 7 === 0) {
      clef = { clef: instrument.clef, octaveChange: size.semitones / 12 };
    } else {
      const average = notes.reduce((total, { note }) => total + midi(note), 0) / notes.length;
      clef = { clef: average >= midi('C4') ? 'treble' : 'bass', octaveChange: 0 };
    }
  }
  return measures.map(() => clef);
}

/** 'treble clef', 'bass clef', 'treble clef (8va: sounds an octave higher)'. */
export function clefWords({ clef, octaveChange }: StaffClef): string {
  const name = `${clef} clef`;
  if (octaveChange === 0) return name;
  const mark = { 1: '8va', 2: '15ma', [-1]: '8vb' }[octaveChange] ?? `${octaveChange} octaves`;
  const how =
    octaveChange > 0
      ? `sounds ${octaveChange === 1 ? 'an octave' : 'two octaves'} higher`
      : 'sounds an octave lower';
  return `${name} ${mark} (${how})`;
}
