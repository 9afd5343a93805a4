import { instruments, type InstrumentSpec } from './instrument-data';
import { intervalSize, type IntervalSize } from './interval';

/** Other names a roster or a director may use for each instrument, in normalised form. */
const usualNames: Record<string, string[]> = {
  piccolo: ['piccolo flute'],
  flute: ['concert flute'],
  oboe: [],
  bassoon: [],
  clarinet: ['soprano clarinet'],
  'bass-clarinet': [],
  'soprano-sax': [],
  'alto-sax': [],
  'tenor-sax': [],
  'bari-sax': ['bari', 'baritone sax'],
  // A cornet reads the same part as the Bb trumpet (common practice, no source).
  trumpet: ['cornet'],
  horn: ['horn', 'double horn', 'french horn'],
  trombone: ['tenor trombone'],
  euphonium: ['baritone', 'baritone horn', 'euphonium bc', 'baritone bc', 'baritone horn bc'],
  'euphonium-tc': ['baritone tc', 'baritone horn tc', 'tc euphonium', 'tc baritone'],
  tuba: ['sousaphone'],
  glockenspiel: ['bells', 'orchestra bells', 'glock'],
  xylophone: [],
  marimba: [],
  violin: [],
  viola: [],
  cello: ['violoncello'],
  'double-bass': ['string bass', 'contrabass', 'upright bass', 'bass', 'acoustic bass'],
};

/** Words that only name the key an instrument is pitched in, dropped before matching. */
const pitchWords = new Set(['in', 'bb', 'eb', 'f', 'c', 'bbb']);

/**
 * Lower case, flat and sharp signs and spelled-out keys as 'bb'/'eb', punctuation as spaces,
 * "saxophone" as "sax", "treble clef" and "bass clef" as "tc" and "bc".
 */
function normalise(name: string): string {
  return name
    .toLowerCase()
    .replace(/♭/g, 'b')
    .replace(/\b([a-g])[\s-]?flat\b/g, '$1b')
    .replace(/[^a-z0-9]+/g, ' ')
    .replace(/\bsaxophone\b/g, 'sax')
    .replace(/\btreble clef\b/g, 'tc')
    .replace(/\bbass clef\b/g, 'bc')
    .trim()
    .replace(/\s+/g, ' ');
}

function withoutPitchWords(name: string): string {
  return name
    .split(' ')
    .filter((word) => !pitchWords.has(word))
    .join(' ');
}

const instrumentsByName = new Map<string, InstrumentSpec>();
for (const instrument of instruments) {
  const names = [instrument.id, instrument.name, ...usualNames[instrument.id]];
  for (const name of names) {
    instrumentsByName.set(normalise(name), instrument);
  }
}

/** The instrument with this id; throws an Error naming the known ids when there is none. */
export function instrumentById(id: string): InstrumentSpec {
  const instrument = instruments.find((candidate) => candidate.id === id);
  if (!instrument) {
    throw new Error(
      `Unknown instrument "${id}": expected one of ${instruments.map((known) => known.id).join(', ')}.`,
    );
  }
  return instrument;
}

/**
 * The instrument an id or a usual name stands for, or undefined. Case, punctuation and the
 * key an instrument is pitched in do not matter: "Alto Saxophone", "French Horn",
 * "Bb Clarinet", "Baritone Sax", "String Bass", "Euphonium TC" and "tenor-sax" all match.
 */
export function findInstrument(nameOrId: string): InstrumentSpec | undefined {
  const name = normalise(nameOrId);
  return instrumentsByName.get(name) ?? instrumentsByName.get(withoutPitchWords(name));
}

/** The diatonic steps and semitones from an instrument's written note to its sounding note. */
export function transpositionSize(instrumentId: string): IntervalSize {
  return intervalSize(instrumentById(instrumentId).transposition);
}
