import {
  articulations,
  findInstrument,
  isMinor,
  majorTonics,
  minorTonics,
  modes,
  patternIds,
  pitchClass,
  schoolLevels,
  type Articulation,
  type Mode,
  type PatternId,
  type PatternPitch,
  type SchoolLevel,
} from '@shared/music';

/** Everything that picks one practice sheet; each field is also a query parameter of /practice. */
export interface SheetRequest {
  tonic: string;
  mode: Mode;
  pattern: PatternId;
  /** Quarter notes per minute. */
  tempo: number;
  articulation: Articulation;
  octaves: 1 | 2;
  instrument: string;
  /** 'written' shows the player's transposed part; 'concert' shows the sounding notes. */
  pitch: PatternPitch;
  /**
   * The player's school level: the pattern is placed inside that level's range, or the sheet
   * says it cannot fit; absent, the instrument's full range.
   */
  level?: SchoolLevel;
}

/** The query parameters of /practice, as the router hands them over. */
export type SheetQuery = Partial<Record<keyof SheetRequest, string | null | undefined>>;

/** The levels the form offers, youngest first. */
export const sheetLevels = schoolLevels;

/** The sheet /practice opens with when the link names nothing. */
export const defaultSheetRequest: SheetRequest = {
  tonic: 'Bb',
  mode: 'major',
  pattern: 'cycle-broad',
  tempo: 100,
  articulation: 'tongued',
  octaves: 1,
  instrument: 'flute',
  pitch: 'written',
};

/** The metronome marks offered as quick buttons (common practice, no source). */
export const usualTempoSteps: readonly number[] = [60, 80, 100, 120];

/** The slowest and fastest tempo the form accepts. */
export const tempoLimits = { slowest: 30, fastest: 240 } as const;

/** The tonics offered for a mode: the 15 minor tonics for minor scales, else the 15 major. */
export function tonicsFor(mode: Mode): readonly string[] {
  return isMinor(mode) ? minorTonics : majorTonics;
}

/**
 * A request from query parameters. Unknown or missing values fall back to the defaults; a
 * tonic given in lower case or with ♭/♯ signs is read as well, and a tonic the mode has no
 * standard key for is respelled on the same pitch (G# major becomes Ab major).
 */
export function parseSheetRequest(query: SheetQuery): SheetRequest {
  const mode = oneOf(query.mode, modes, defaultSheetRequest.mode);
  const tempo = Math.round(Number(query.tempo));
  return {
    tonic: tonicFor(query.tonic, mode),
    mode,
    pattern: oneOf(query.pattern, patternIds, defaultSheetRequest.pattern),
    tempo:
      Number.isFinite(tempo) && tempo >= tempoLimits.slowest && tempo <= tempoLimits.fastest
        ? tempo
        : defaultSheetRequest.tempo,
    articulation: oneOf(query.articulation, articulations, defaultSheetRequest.articulation),
    octaves: query.octaves === '2' ? 2 : 1,
    instrument: findInstrument(query.instrument ?? '')?.id ?? defaultSheetRequest.instrument,
    pitch: query.pitch === 'concert' ? 'concert' : 'written',
    ...(schoolLevels.includes(query.level as SchoolLevel)
      ? { level: query.level as SchoolLevel }
      : {}),
  };
}

/** The query parameters that open a request again (the inverse of parseSheetRequest). */
export function toSheetQuery(request: SheetRequest): Record<keyof SheetRequest, string | null> {
  return {
    tonic: request.tonic,
    mode: request.mode,
    pattern: request.pattern,
    tempo: String(request.tempo),
    articulation: request.articulation,
    octaves: String(request.octaves),
    instrument: request.instrument,
    pitch: request.pitch,
    level: request.level ?? null,
  };
}

/**
 * The tonic offered for `mode` that names `tonic` or sounds the same, else the default. Used
 * when the mode changes under a chosen tonic (Gb major → F# minor).
 */
export function tonicFor(tonic: string | null | undefined, mode: Mode): string {
  const offered = tonicsFor(mode);
  const spelled = (tonic ?? '')
    .trim()
    .replace(/♭/g, 'b')
    .replace(/♯/g, '#')
    .replace(/^([a-g])/, (letter) => letter.toUpperCase());
  if (offered.includes(spelled)) return spelled;
  if (/^[A-G](##|#|bb|b)?$/.test(spelled)) {
    const sameSound = offered.find((candidate) => pitchClass(candidate) === pitchClass(spelled));
    if (sameSound) return sameSound;
  }
  return offered.includes(defaultSheetRequest.tonic) ? defaultSheetRequest.tonic : offered[0];
}

function oneOf<T extends string>(
  value: string | null | undefined,
  known: readonly T[],
  fallback: T,
): T {
  return known.includes(value as T) ? (value as T) : fallback;
}
