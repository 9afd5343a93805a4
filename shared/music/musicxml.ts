import { sheetClefs, type StaffClef } from './clefs';
import { instrumentById, transpositionSize } from './instruments';
import type { InstrumentSpec } from './instrument-data';
import { isMinor, keySignature, type Key } from './keys';
import { beamOf, divisionsFor, layOutMeasures, type NotatedPiece } from './measure-layout';
import type { Articulation, PatternNote, PatternPitch } from './patterns';
import { parseNote, type Letter } from './pitch';
import { writtenKey } from './transposition';

/** What a MusicXML practice sheet holds. */
export interface MusicXmlOptions {
  title: string;
  instrumentId: string;
  /** The concert key of the requirement; a written sheet carries the instrument's written key. */
  key: Key;
  /** The notes, in the pitch named by `pitch`. */
  notes: PatternNote[];
  pitch: PatternPitch;
  /** Quarter notes per minute. */
  tempo: number;
  articulation: Articulation;
}

const clefs: Record<InstrumentSpec['clef'], { sign: string; line: number }> = {
  treble: { sign: 'G', line: 2 },
  bass: { sign: 'F', line: 4 },
  alto: { sign: 'C', line: 3 },
};

const articulationWords: Record<Articulation, string> = {
  tongued: 'Tongue every note',
  slurred: 'Slur up, slur down',
  'tongue-up-slur-down': 'Tongue up, slur down',
};

const accidentalNames: Record<number, string> = {
  [-2]: 'flat-flat',
  [-1]: 'flat',
  0: 'natural',
  1: 'sharp',
  2: 'double-sharp',
};

const sharpOrder: Letter[] = ['F', 'C', 'G', 'D', 'A', 'E', 'B'];

/**
 * A MusicXML 4.0 partwise document of one practice pattern, following the W3C Music Notation
 * Community Group's schema: 4/4 measures, the key signature of the sheet's key (the written
 * key for a written sheet), the clef the sheet shows (`sheetClefs`: the concert clef on a concert
 * sheet, the marimba's bass clef for low measures), a <transpose> element on a written sheet of
 * a transposing instrument, the tempo as a metronome mark with <sound tempo>, and slurs.
 */
export function toMusicXml(options: MusicXmlOptions): string {
  const instrument = instrumentById(options.instrumentId);
  if (!(options.tempo > 0)) {
    throw new Error(`A tempo must be a positive number of beats per minute, not ${options.tempo}.`);
  }
  const sheetKey =
    options.pitch === 'written' ? writtenKey(options.key, instrument.id) : options.key;
  const fifths = keySignature(sheetKey);
  const divisions = divisionsFor(options.notes);
  const measures = layOutMeasures(options.notes);
  const staffClefs = sheetClefs(instrument.id, options.notes, options.pitch);

  const measureXml = measures.map((pieces, index) => {
    const parts = [`<measure number="${index + 1}">`];
    if (index === 0) {
      parts.push(
        attributesXml(divisions, sheetKey, fifths, instrument, options.pitch, staffClefs[0]),
      );
      parts.push(directionsXml(options.tempo, options.articulation));
    } else if (!sameClef(staffClefs[index], staffClefs[index - 1])) {
      parts.push(`<attributes>${clefXml(staffClefs[index])}</attributes>`);
    }
    const shown = new Map<string, number>();
    pieces.forEach((piece, pieceIndex) => {
      parts.push(noteXml(piece, divisions, fifths, shown, beamOf(pieces, pieceIndex)));
    });
    if (index === measures.length - 1) {
      parts.push('<barline location="right"><bar-style>light-heavy</bar-style></barline>');
    }
    parts.push('</measure>');
    return parts.join('');
  });

  return [
    '<?xml version="1.0" encoding="UTF-8" standalone="no"?>',
    '<!DOCTYPE score-partwise PUBLIC "-//Recordare//DTD MusicXML 4.0 Partwise//EN" "http://www.musicxml.org/dtds/partwise.dtd">',
    '<score-partwise version="4.0">',
    `<work><work-title>${escapeXml(options.title)}</work-title></work>`,
    '<identification><encoding><software>Tuttiboard</software></encoding></identification>',
    '<part-list><score-part id="P1">',
    `<part-name>${escapeXml(instrument.name)}</part-name>`,
    '</score-part></part-list>',
    '<part id="P1">',
    ...measureXml,
    '</part>',
    '</score-partwise>',
    '',
  ].join('\n');
}

function attributesXml(
  divisions: number,
  sheetKey: Key,
  fifths: number,
  instrument: InstrumentSpec,
  pitch: PatternPitch,
  clef: StaffClef,
): string {
  const mode = sheetKey.mode === 'chromatic' ? '' : isMinor(sheetKey.mode) ? 'minor' : 'major';
  return [
    '<attributes>',
    `<divisions>${divisions}</divisions>`,
    `<key><fifths>${fifths}</fifths>${mode ? `<mode>${mode}</mode>` : ''}</key>`,
    '<time><beats>4</beats><beat-type>4</beat-type></time>',
    clefXml(clef),
    pitch === 'written' ? transposeXml(instrument) : '',
    '</attributes>',
  ].join('');
}

/**
 * A clef with its octave mark: MusicXML 4.0 <clef-octave-change> is the octaves the music
 * sounds from where the staff shows it, while <pitch> keeps the sounding note (the treble clef
 * with an 8 above for a piccolo's concert part).
 */
function clefXml({ clef, octaveChange }: StaffClef): string {
  const { sign, line } = clefs[clef];
  const change =
    octaveChange === 0 ? '' : `<clef-octave-change>${octaveChange}</clef-octave-change>`;
  return `<clef><sign>${sign}</sign><line>${line}</line>${change}</clef>`;
}

function sameClef(a: StaffClef, b: StaffClef): boolean {
  return a.clef === b.clef && a.octaveChange === b.octaveChange;
}

/**
 * MusicXML's <transpose> adds diatonic steps and semitones within an octave to the written
 * note, and whole octaves through <octave-change>: the tenor saxophone's major 9th down is
 * diatonic −1, chromatic −2, octave-change −1.
 */
function transposeXml(instrument: InstrumentSpec): string {
  const size = transpositionSize(instrument.id);
  if (size.diatonicSteps === 0 && size.semitones === 0) return '';
  const octaves = Math.trunc(size.diatonicSteps / 7);
  const diatonic = size.diatonicSteps - 7 * octaves;
  const chromatic = size.semitones - 12 * octaves;
  return [
    '<transpose>',
    `<diatonic>${diatonic}</diatonic>`,
    `<chromatic>${chromatic}</chromatic>`,
    octaves === 0 ? '' : `<octave-change>${octaves}</octave-change>`,
    '</transpose>',
  ].join('');
}

function directionsXml(tempo: number, articulation: Articulation): string {
  return [
    '<direction placement="above"><direction-type><metronome>',
    `<beat-unit>quarter</beat-unit><per-minute>${tempo}</per-minute>`,
    `</metronome></direction-type><sound tempo="${tempo}"/></direction>`,
    '<direction placement="below"><direction-type>',
    `<words>${escapeXml(articulationWords[articulation])}</words>`,
    '</direction-type></direction>',
  ].join('');
}

function noteXml(
  piece: NotatedPiece,
  divisions: number,
  fifths: number,
  shown: Map<string, number>,
  beam: 'begin' | 'end' | undefined,
): string {
  const duration = `<duration>${piece.beats * divisions}</duration>`;
  const value = `<voice>1</voice><type>${piece.type}</type>${piece.dotted ? '<dot/>' : ''}`;
  if (piece.note === null) {
    return `<note><rest/>${duration}${value}</note>`;
  }
  const pitch = parseNote(piece.note, true);
  const place = `${pitch.letter}${pitch.octave}`;
  const current = shown.get(place) ?? signatureAlteration(pitch.letter, fifths);
  // A tied-over note keeps the accidental of the note it continues and shows none.
  const accidental =
    current !== pitch.alteration && !piece.tieStop
      ? `<accidental>${accidentalNames[pitch.alteration]}</accidental>`
      : '';
  shown.set(place, pitch.alteration);

  const ties = `${piece.tieStop ? '<tie type="stop"/>' : ''}${piece.tieStart ? '<tie type="start"/>' : ''}`;
  const notations = [
    piece.tieStop ? '<tied type="stop"/>' : '',
    piece.tieStart ? '<tied type="start"/>' : '',
    piece.slurStop ? '<slur type="stop" number="1"/>' : '',
    piece.slurStart ? '<slur type="start" number="1"/>' : '',
  ].join('');
  return [
    '<note><pitch>',
    `<step>${pitch.letter}</step>`,
    pitch.alteration === 0 ? '' : `<alter>${pitch.alteration}</alter>`,
    `<octave>${pitch.octave}</octave></pitch>`,
    duration,
    ties,
    value,
    accidental,
    beam ? `<beam number="1">${beam}</beam>` : '',
    notations ? `<notations>${notations}</notations>` : '',
    '</note>',
  ].join('');
}

/** The alteration a key signature gives a letter: F C G D A E B take sharps in that order. */
function signatureAlteration(letter: Letter, fifths: number): number {
  const place = sharpOrder.indexOf(letter);
  if (fifths > 0) return place < fifths ? 1 : 0;
  if (fifths < 0) return 6 - place < -fifths ? -1 : 0;
  return 0;
}

function escapeXml(text: string): string {
  return text
    .replace(/&/g, '&amp;')
    .replace(/</g, '&lt;')
    .replace(/>/g, '&gt;')
    .replace(/"/g, '&quot;')
    .replace(/'/g, '&apos;');
}
