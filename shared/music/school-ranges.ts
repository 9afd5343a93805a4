import type { InstrumentSpec, NoteRange } from './instrument-data';
import { instrumentById } from './instruments';
import { checkKey, keyName, type Key } from './keys';
import type { PatternId } from './pattern-shapes';
import { placedPattern, type Articulation, type PatternNote, type PatternPitch } from './patterns';
import { midi } from './pitch';

/** The school a developing player is in. */
export type SchoolLevel = 'elementary' | 'middle' | 'high';

/** Every school level, youngest first. */
export const schoolLevels: readonly SchoolLevel[] = ['elementary', 'middle', 'high'];

/** 'elementary school', 'middle school', 'high school'. */
export const schoolLevelNames: Record<SchoolLevel, string> = {
  elementary: 'elementary school',
  middle: 'middle school',
  high: 'high school',
};

/**
 * The school level of a grade: kindergarten to 5 elementary, 6 to 8 middle, 9 to 12 high
 * (common practice, no source: the usual grade bands of United States school districts).
 */
export function levelOfGrade(grade: number): SchoolLevel {
  if (grade <= 5) return 'elementary';
  if (grade <= 8) return 'middle';
  return 'high';
}

/*
 * Written ranges a developing player can be asked to play, by school level.
 * Source: common practice, no source. These are a teacher's judgement from memory, of the kind
 * state and district scale requirements assume, narrowed from the professional ranges in
 * Samuel Adler, The Study of Orchestration (3rd ed., 2002; from memory); they should be
 * confirmed against a published school method before they are relied on. An instrument's
 * `range` (where patterns are placed) stays the widest a school sheet is drawn in; the high
 * school range may be narrower where `range` reaches notes few high-school players have
 * (piccolo to C7, horn to C6, tuba's E1, double bass in thumb position to C5).
 * Keyboard percussion ranges are the instrument's bars, the same at every level, except that a
 * young player keeps to the two middle octaves.
 */
const rangeTable: Record<string, string> = {
  // instrument: 'lowest-highest' in elementary, middle and high school
  piccolo: 'D4-D6 D4-G6 D4-A6',
  flute: 'C4-C6 C4-G6 C4-C7',
  oboe: 'C4-C6 Bb3-D6 Bb3-F6',
  bassoon: 'C2-G4 Bb1-A4 Bb1-D5',
  // Elementary players cross the break (written Bb4 to B4) to G5 at the top of the staff.
  clarinet: 'E3-G5 E3-C6 E3-G6',
  'bass-clarinet': 'E3-G5 E3-G5 Eb3-C6',
  'soprano-sax': 'D4-C6 Bb3-D6 Bb3-F6',
  'alto-sax': 'D4-C6 Bb3-D6 Bb3-F6',
  'tenor-sax': 'D4-C6 Bb3-D6 Bb3-F6',
  'bari-sax': 'D4-C6 Bb3-D6 Bb3-F6',
  trumpet: 'G3-G5 F#3-G5 F#3-C6',
  // Elementary players reach written F5, so the first band scale (concert Bb, written F4–F5)
  // fits.
  horn: 'G3-F5 G3-G5 F#3-A5',
  trombone: 'F2-F4 E2-Bb4 E2-F5',
  euphonium: 'F2-F4 E2-Bb4 E2-F5',
  // The bass-clef ranges written a major 9th higher.
  'euphonium-tc': 'G3-G5 F#3-C6 F#3-G6',
  tuba: 'Bb1-Bb3 G1-C4 F1-F4',
  glockenspiel: 'G3-C6 G3-C6 G3-C6',
  xylophone: 'C4-C6 F3-C7 F3-C7',
  marimba: 'C4-C6 C3-C7 C3-C7',
  // First position (to B5) in elementary school, third position in middle school.
  violin: 'G3-B5 G3-D6 G3-A6',
  viola: 'C3-E5 C3-A5 C3-D6',
  cello: 'C2-D4 C2-A4 C2-C5',
  // Written; the bass sounds an octave lower. Elementary players use the lower positions to D4
  // (third position on the G string); C5 in thumb position is beyond high school.
  'double-bass': 'E2-D4 E2-G4 E2-Bb4',
};

/** The written range of each instrument at each school level, read from the table above. */
export const schoolRanges: Record<string, Record<SchoolLevel, NoteRange>> = Object.fromEntries(
  Object.entries(rangeTable).map(([id, row]) => {
    const spans = row.split(' ').map((span) => {
      const [lowest, highest] = span.split('-') as [string, string];
      return { lowest, highest };
    });
    return [id, Object.fromEntries(schoolLevels.map((level, index) => [level, spans[index]!]))];
  }),
) as Record<string, Record<SchoolLevel, NoteRange>>;

/** Whether a requirement fits one instrument at one school level, and where it is placed. */
export type LevelReach =
  | { level: SchoolLevel; fits: true; lowest: string; highest: string }
  | { level: SchoolLevel; fits: false; message: string };

/** What a requirement asks, as far as where it lies. */
export interface ReachRequest {
  pattern: PatternId;
  key: Key;
  octaves: 1 | 2;
}

/** The written range of an instrument at a school level. */
export function schoolRange(instrumentId: string, level: SchoolLevel): NoteRange {
  const ranges = schoolRanges[instrumentById(instrumentId).id];
  return ranges[level];
}

/**
 * The pattern placed for a player at a school level: the lowest octave whose written notes lie
 * inside both that level's range and the instrument's beginner range (where the sheet places
 * it), else the lowest inside the level's range, or null when no octave fits the level
 * ("cannot fit this level").
 */
export function patternForLevel(
  request: ReachRequest,
  instrumentId: string,
  level: SchoolLevel,
  options: { pitch?: PatternPitch; articulation?: Articulation } = {},
): PatternNote[] | null {
  checkKey(request.key);
  const instrument = instrumentById(instrumentId);
  const range = schoolRange(instrument.id, level);
  // The octave the sheet itself prefers (inside the beginner's range) when the level allows it.
  const preferred: NoteRange = {
    lowest: higher(range.lowest, instrument.beginnerRange.lowest),
    highest: lower(range.highest, instrument.beginnerRange.highest),
  };
  return placedPattern(
    request.pattern,
    request.key,
    instrument,
    options.pitch ?? 'written',
    request.octaves,
    options.articulation ?? 'tongued',
    [preferred, range],
  );
}

/**
 * Whether a requirement can be placed inside a school level's written range for one
 * instrument. When it cannot, the message says so in a director's words and names the note
 * the nearest placement would need: 'Cannot fit this level: two octaves of concert C major
 * (written C) for a middle-school piccolo need written C7; its range ends at G6.'
 */
export function levelReach(
  request: ReachRequest,
  instrumentId: string,
  level: SchoolLevel,
): LevelReach {
  const instrument = instrumentById(instrumentId);
  const notes = patternForLevel(request, instrument.id, level);
  if (notes) {
    const values = notes.map(({ note }) => midi(note));
    const low = notes[values.indexOf(Math.min(...values))].note;
    const high = notes[values.indexOf(Math.max(...values))].note;
    return { level, fits: true, lowest: low, highest: high };
  }
  return { level, fits: false, message: cannotFit(request, instrument, level) };
}

function cannotFit(request: ReachRequest, instrument: InstrumentSpec, level: SchoolLevel): string {
  const range = schoolRange(instrument.id, level);
  const what = `${request.octaves === 2 ? 'two octaves' : 'one octave'} of concert ${keyName(request.key)}`;
  const levelWords = schoolLevelNames[level].replace(' school', '-school');
  const who = `${level === 'elementary' ? 'an' : 'a'} ${levelWords} ${instrumentWords(instrument)}`;
  const widest = placedPattern(
    request.pattern,
    request.key,
    instrument,
    'written',
    request.octaves,
    'tongued',
    [instrument.range],
  );
  if (!widest) {
    return `Cannot fit this level: ${what} is beyond the ${instrumentWords(instrument)}'s range.`;
  }
  const values = widest.map(({ note }) => midi(note));
  const low = widest[values.indexOf(Math.min(...values))].note;
  const high = widest[values.indexOf(Math.max(...values))].note;
  const need =
    midi(high) > midi(range.highest)
      ? `needs written ${high}; the range ends at ${range.highest}`
      : `needs written ${low}; the range starts at ${range.lowest}`;
  return `Cannot fit this level: ${what} for ${who} ${need} (${schoolLevelNames[level]} range written ${range.lowest}–${range.highest}).`;
}

function higher(a: string, b: string): string {
  return midi(a) >= midi(b) ? a : b;
}

function lower(a: string, b: string): string {
  return midi(a) <= midi(b) ? a : b;
}

/** 'piccolo', 'French horn': an instrument's name as it reads inside a sentence. */
function instrumentWords(instrument: InstrumentSpec): string {
  return instrument.name.toLowerCase().replace('french', 'French');
}
