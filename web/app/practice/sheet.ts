import {
  clefWords,
  durationSeconds,
  instrumentById,
  keySignature,
  levelReach,
  patternForLevel,
  schoolLevelNames,
  schoolLevels,
  pattern,
  PatternRangeError,
  sheetClefs,
  writtenKey,
  type InstrumentSpec,
  type Key,
  type LevelReach,
  type PatternNote,
  type StaffClef,
} from '@shared/music';
import { instrumentInText, octaveNote } from './instrument-label';
import { keyWords, secondsText, withAccidentalSigns } from './labels';
import type { SheetRequest } from './sheet-request';

/** What a staff needs to draw a pattern. */
export interface StaffMusic {
  notes: PatternNote[];
  /** The clef the staff opens with. */
  clef: InstrumentSpec['clef'];
  /** The clef of every measure, with its octave mark (the engine's `sheetClefs`). */
  clefs: StaffClef[];
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
  /** Whether the requirement fits an elementary, middle and high school player's range. */
  levels: LevelReach[];
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
  let placed: PlacedNotes | string;
  try {
    placed = placedNotes(request, instrument, concertKey);
  } catch (error) {
    if (!(error instanceof PatternRangeError)) throw error;
    placed = error.message;
  }
  if (typeof placed === 'string') {
    return { kind: 'out-of-range', request, instrument, message: withAccidentalSigns(placed) };
  }
  const { concertNotes } = placed;
  const atConcert = request.pitch === 'concert';
  const sheetKey = atConcert ? concertKey : writtenKey(concertKey, instrument.id);
  const notes = atConcert ? concertNotes : placed.writtenNotes;
  const clefs = sheetClefs(instrument.id, notes, request.pitch);
  return {
    kind: 'ready',
    request,
    instrument,
    concertKey,
    sheetKey,
    staff: {
      notes,
      clef: clefs[0].clef,
      clefs,
      fifths: keySignature(sheetKey),
      tempo: request.tempo,
    },
    concertNotes,
    caption: sheetCaption(request, instrument, concertKey, clefs[0]),
    levels: levelReaches(request, instrument, concertKey),
    durationText: `about ${secondsText(durationSeconds(concertNotes, request.tempo))} at ♩ = ${request.tempo}`,
  };
}

/** The pattern's notes at concert and written pitch. */
interface PlacedNotes {
  concertNotes: PatternNote[];
  writtenNotes: PatternNote[];
}

/**
 * The pattern's notes; with a school level, placed inside that player's range
 * (patternForLevel), or the reason the level cannot play it.
 */
function placedNotes(
  request: SheetRequest,
  instrument: InstrumentSpec,
  concertKey: Key,
): PlacedNotes | string {
  const { level, articulation } = request;
  if (!level) {
    const options = { instrument: instrument.id, octaves: request.octaves, articulation };
    return {
      concertNotes: pattern(request.pattern, concertKey, { ...options, pitch: 'concert' }),
      writtenNotes: pattern(request.pattern, concertKey, { ...options, pitch: 'written' }),
    };
  }
  const reach = { pattern: request.pattern, key: concertKey, octaves: request.octaves };
  const placed = (pitch: 'concert' | 'written') =>
    patternForLevel(reach, instrument.id, level, { pitch, articulation });
  const concertNotes = placed('concert');
  const writtenNotes = placed('written');
  if (concertNotes && writtenNotes) return { concertNotes, writtenNotes };
  const outcome = levelReach(reach, instrument.id, level);
  return outcome.fits
    ? `This pattern does not fit a ${schoolLevelNames[level]} player's range.`
    : outcome.message;
}

/** 'Concert Bb major → written C major for Bb clarinet, treble clef'. */
function sheetCaption(
  request: SheetRequest,
  instrument: InstrumentSpec,
  concertKey: Key,
  firstClef: StaffClef,
): string {
  const written = writtenKey(concertKey, instrument.id);
  const clefText = clefWords(firstClef);
  const player = instrumentInText(instrument.id);
  const octave = octaveNote(instrument);
  return request.pitch === 'concert'
    ? `Concert ${keyWords(concertKey)} at concert pitch for ${player}, ${clefText} ` +
        `(the player reads ${keyWords(written)})`
    : `Concert ${keyWords(concertKey)} → written ${keyWords(written)} for ${player}, ` +
        `${clefText}${octave ? ` (${octave})` : ''}`;
}

/** Whether the requirement fits each school level's range, its notes spelt with signs. */
function levelReaches(request: SheetRequest, instrument: InstrumentSpec, concertKey: Key) {
  return schoolLevels.map((level): LevelReach => {
    const reach = levelReach(
      { pattern: request.pattern, key: concertKey, octaves: request.octaves },
      instrument.id,
      level,
    );
    return reach.fits
      ? {
          ...reach,
          lowest: withAccidentalSigns(reach.lowest),
          highest: withAccidentalSigns(reach.highest),
        }
      : { ...reach, message: withAccidentalSigns(reach.message) };
  });
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
