import {
  keyName,
  type Articulation,
  type InstrumentFamily,
  type Key,
  type Mode,
  type PatternId,
} from '@shared/music';

/**
 * Text with its note names written with real accidentals, as the ladder writes them ('Eb
 * major' → 'E♭ major', 'Bb3' → 'B♭3', 'F#' → 'F♯', 'Ebb' → 'E♭♭'; Unicode's musical symbols
 * U+266D and U+266F). A name is a letter A to G standing alone, with its accidentals and an
 * optional octave number.
 */
export function withAccidentalSigns(text: string): string {
  return text.replace(
    /(?<![A-Za-z])([A-G])(bb|b|##|#)(?=-?\d|[^A-Za-z0-9]|$)/g,
    (_whole, letter: string, accidentals: string) =>
      letter + accidentals.replace(/b/g, '\u266D').replace(/#/g, '\u266F'),
  );
}

/** A key in words with real accidentals: 'E♭ major', 'F♯ harmonic minor'. */
export function keyWords(key: Key): string {
  return withAccidentalSigns(keyName(key));
}

/** The form's names for each mode. */
export const modeLabels: Record<Mode, string> = {
  major: 'Major',
  'natural-minor': 'Natural minor',
  'harmonic-minor': 'Harmonic minor',
  'melodic-minor': 'Melodic minor',
  chromatic: 'Chromatic',
};

/** The form's names for each practice pattern. */
export const patternLabels: Record<PatternId, string> = {
  'long-tones': 'Long tones (whole notes)',
  'arpeggio-long': 'Arpeggio in long tones',
  'cycle-broad': 'Scale and arpeggio, broad (half and quarter notes)',
  'cycle-brisk': 'Scale and arpeggio, brisk (quarter and eighth notes)',
};

/** The form's names for each articulation. */
export const articulationLabels: Record<Articulation, string> = {
  tongued: 'Tongue (or bow) every note',
  slurred: 'Slur up, slur down',
  'tongue-up-slur-down': 'Tongue up, slur down',
};

/** The headings of the instrument families, as a band or orchestra seats them. */
export const familyLabels: Record<InstrumentFamily, string> = {
  woodwind: 'Woodwinds',
  brass: 'Brass',
  percussion: 'Mallet percussion',
  strings: 'Strings',
};

/** How a clef is named in a caption. */
export const clefLabels: Record<'treble' | 'bass' | 'alto', string> = {
  treble: 'treble clef',
  bass: 'bass clef',
  alto: 'alto clef',
};

/** A length of time as a player reads it: '17 s', '1 min 5 s'. */
export function secondsText(seconds: number): string {
  const rounded = Math.round(seconds);
  if (rounded < 60) return `${rounded} s`;
  const minutes = Math.floor(rounded / 60);
  const rest = rounded % 60;
  return rest === 0 ? `${minutes} min` : `${minutes} min ${rest} s`;
}
