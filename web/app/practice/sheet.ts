import {
  durationSeconds,
  instrumentById,
  keyName,
  keySignature,
  midi,
  pattern,
  PatternRangeError,
  transpositionSize,
  writtenKey,
  type InstrumentSpec,
  type Key,
  type PatternNote,
} from '../../../shared/music';
import { instrumentInText, octaveNote } from './instrument-label';
import { clefLabels, secondsText } from './labels';
import type { SheetRequest } from './sheet-request';

/** What a staff needs to draw a pattern. */
export interface StaffMusic {
  notes: PatternNote[];
  clef: InstrumentSpec['clef'];
  /** Sharps (positive) or flats (negative) of the key signature. */
  fifths: number;
  /** Quarter notes per minute, shown as the metronome mark. */
  tempo: number;
}

/** A sheet that can be shown, printed, played and downloaded. */
export interface ReadySheet {
  kind: 'ready';
  request: SheetRequest;
  instrument: InstrumentSpec;
  concertKey: Key;
  /** The key the staff is written in: the written key, or the concert key at concert pitch. */
  sheetKey: Key;
  staff: StaffMusic;
  /** The sounding notes, for playback. */
  concertNotes: PatternNote[];
  /** 'Concert Bb major → written C major for Bb clarinet, treble clef'. */
  caption: string;
  /** 'about 17 s at ♩ = 100'. */
  durationText: string;
}

/** A request the instrument cannot play: no octave of the pattern fits its range. */
export interface OutOfRangeSheet {
  kind: 'out-of-range';
  request: SheetRequest;
  instrument: InstrumentSpec;
  message: string;
}

/** The outcome of building a sheet. */
export type Sheet = ReadySheet | OutOfRangeSheet;

/**
 * Builds the sheet for a request: the pattern in the instrument's written pitch (or at concert
 * pitch when asked), its clef, key signature and caption, and the concert notes for playback.
 * A PatternRangeError becomes an out-of-range sheet carrying the engine's message; any other
 * error is a programming error and is thrown.
 */
export function buildSheet(request: SheetRequest): Sheet {
  const instrument = instrumentById(request.instrument);
  const concertKey: Key = { tonic: request.tonic, mode: request.mode };
  const options = {
    instrument: instrument.id,
    octaves: request.octaves,
    articulation: request.articulation,
  };
  let concertNotes: PatternNote[];
  let writtenNotes: PatternNote[];
  try {
    concertNotes = pattern(request.pattern, concertKey, { ...options, pitch: 'concert' });
    writtenNotes = pattern(request.pattern, concertKey, { ...options, pitch: 'written' });
  } catch (error) {
    if (error instanceof PatternRangeError) {
      return { kind: 'out-of-range', request, instrument, message: error.message };
    }
    throw error;
  }
  const written = writtenKey(concertKey, instrument.id);
  const atConcert = request.pitch === 'concert';
  const sheetKey = atConcert ? concertKey : written;
  const notes = atConcert ? concertNotes : writtenNotes;
  const clef = atConcert ? concertClef(instrument, concertNotes) : instrument.clef;
  const player = instrumentInText(instrument.id);
  const octave = octaveNote(instrument);
  const caption = atConcert
    ? `Concert ${keyName(concertKey)} at concert pitch for ${player}, ${clefLabels[clef]} ` +
      `(the player reads ${keyName(written)})`
    : `Concert ${keyName(concertKey)} → written ${keyName(written)} for ${player}, ` +
      `${clefLabels[clef]}${octave ? ` (${octave})` : ''}`;
  return {
    kind: 'ready',
    request,
    instrument,
    concertKey,
    sheetKey,
    staff: { notes, clef, fifths: keySignature(sheetKey), tempo: request.tempo },
    concertNotes,
    caption,
    durationText: `about ${secondsText(durationSeconds(concertNotes, request.tempo))} at ♩ = ${request.tempo}`,
  };
}

/**
 * The clef for a transposing instrument's part shown at concert pitch: treble when the pattern
 * sounds mostly from middle C up, bass below it (a tenor saxophone's concert part reads best in
 * bass clef). The viola keeps its alto clef; instruments that sound as written keep theirs.
 */
function concertClef(instrument: InstrumentSpec, concertNotes: PatternNote[]): StaffMusic['clef'] {
  if (transpositionSize(instrument.id).semitones === 0 || instrument.clef === 'alto') {
    return instrument.clef;
  }
  const average =
    concertNotes.reduce((total, { note }) => total + midi(note), 0) / concertNotes.length;
  return average >= midi('C4') ? 'treble' : 'bass';
}

/**
 * The MusicXML file name of a sheet: 'bb-major-cycle-broad-clarinet.musicxml', with
 * '-concert' before the extension for a concert-pitch sheet.
 */
export function musicXmlFileName(request: SheetRequest): string {
  const tonic = request.tonic.toLowerCase().replace(/#/g, '-sharp');
  const pitch = request.pitch === 'concert' ? '-concert' : '';
  return `${tonic}-${request.mode}-${request.pattern}-${request.instrument}${pitch}.musicxml`;
}
