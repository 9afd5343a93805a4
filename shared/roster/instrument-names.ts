/** The instrument ids Tuttiboard knows, the same ids the music engine uses. */
export const instrumentIds = [
  'piccolo',
  'flute',
  'oboe',
  'bassoon',
  'clarinet',
  'bass-clarinet',
  'alto-sax',
  'tenor-sax',
  'bari-sax',
  'soprano-sax',
  'trumpet',
  'horn',
  'trombone',
  'euphonium',
  'euphonium-tc',
  'tuba',
  'glockenspiel',
  'xylophone',
  'marimba',
  'violin',
  'viola',
  'cello',
  'double-bass',
] as const;

/** One of {@link instrumentIds}. */
export type InstrumentId = (typeof instrumentIds)[number];

// The names directors and student information systems use for each instrument; ids match too.
const usualNames: Readonly<Record<InstrumentId, readonly string[]>> = {
  piccolo: ['Piccolo'],
  flute: ['Flute', 'Concert Flute', 'C Flute'],
  oboe: ['Oboe'],
  bassoon: ['Bassoon'],
  clarinet: ['Clarinet', 'Bb Clarinet', 'B-flat Clarinet', 'Soprano Clarinet'],
  'bass-clarinet': ['Bass Clarinet', 'Bb Bass Clarinet', 'B-flat Bass Clarinet'],
  'alto-sax': ['Alto Saxophone', 'Alto Sax', 'Eb Alto Saxophone', 'E-flat Alto Saxophone'],
  'tenor-sax': ['Tenor Saxophone', 'Tenor Sax', 'Bb Tenor Saxophone', 'B-flat Tenor Saxophone'],
  'bari-sax': [
    'Baritone Saxophone',
    'Baritone Sax',
    'Bari Sax',
    'Bari Saxophone',
    'Eb Baritone Saxophone',
  ],
  'soprano-sax': ['Soprano Saxophone', 'Soprano Sax', 'Bb Soprano Saxophone'],
  trumpet: ['Trumpet', 'Bb Trumpet', 'B-flat Trumpet', 'Cornet', 'Bb Cornet'],
  horn: ['Horn', 'French Horn', 'Horn in F', 'F Horn', 'Double Horn'],
  trombone: ['Trombone', 'Tenor Trombone', 'Bass Trombone'],
  euphonium: [
    'Euphonium',
    'Baritone',
    'Baritone BC',
    'Baritone Bass Clef',
    'Baritone Horn',
    'Euphonium BC',
    'Euphonium Bass Clef',
  ],
  'euphonium-tc': ['Euphonium TC', 'Euphonium Treble Clef', 'Baritone TC', 'Baritone Treble Clef'],
  tuba: ['Tuba', 'Sousaphone', 'BBb Tuba'],
  glockenspiel: ['Glockenspiel', 'Bells', 'Orchestra Bells', 'Percussion'],
  xylophone: ['Xylophone'],
  marimba: ['Marimba'],
  violin: ['Violin'],
  viola: ['Viola'],
  cello: ['Cello', 'Violoncello'],
  'double-bass': ['Double Bass', 'String Bass', 'Upright Bass', 'Contrabass', 'Bass Violin'],
};

// "Percussion" and "Bells" name a section as often as an instrument, and "Baritone" alone may be a
// baritone saxophone: a cell that says only that is taken at its usual meaning, but a class title
// that mentions it ("Percussion Ensemble") names no instrument.
const sectionWords = new Set(['percussion', 'bells', 'baritone']);

const flatSpelling = /\b([a-g])(?:\s*-\s*|\s+)?(?:flat|\u266d)(?=\s|$)/g;
const notLetterOrDigit = /[^a-z0-9]+/g;

/**
 * The form instrument names are compared in: lower case, "B-flat" and "B♭" written "bb", and
 * nothing but letters and digits.
 */
function comparable(name: string): string {
  return name.toLowerCase().replace(flatSpelling, '$1b').replace(notLetterOrDigit, '');
}

const idByName = new Map<string, InstrumentId>();
const recentCells = new Map<string, InstrumentId | null>();
const rememberedCells = 1000;
for (const id of instrumentIds) {
  idByName.set(comparable(id), id);
  for (const name of usualNames[id]) idByName.set(comparable(name), id);
}

/**
 * The instrument id a roster cell names, from the id itself or one of the instrument's usual
 * names ("Alto Saxophone", "French Horn", "Bb Clarinet", "Cornet"), ignoring case, spaces and
 * punctuation; null when the cell names no instrument we know (or is empty).
 */
export function resolveInstrument(cell: string): InstrumentId | null {
  const remembered = recentCells.get(cell);
  if (remembered !== undefined) return remembered;
  const key = comparable(cell);
  const id = key === '' ? null : (idByName.get(key) ?? null);
  // A roster repeats a handful of instrument spellings thousands of times.
  if (recentCells.size >= rememberedCells) recentCells.clear();
  recentCells.set(cell, id);
  return id;
}

const wordSplit = /[^a-z0-9]+/;
const longestNameInWords = 3;

/**
 * The one instrument a longer text names, such as a class title ("Beginning Band - Clarinet",
 * "Violin 2"); null when it names none, names more than one, or only names a section
 * ("Percussion Ensemble", "Jazz Band"). Used where a guess must stay cautious.
 */
export function instrumentNamedIn(text: string): InstrumentId | null {
  const words = text
    .toLowerCase()
    .replace(flatSpelling, '$1b')
    .split(wordSplit)
    .filter((word) => word !== '');
  const found = new Set<InstrumentId>();
  let index = 0;
  while (index < words.length) {
    let matched = 0;
    for (let length = Math.min(longestNameInWords, words.length - index); length > 0; length--) {
      const phrase = words.slice(index, index + length);
      if (length === 1 && sectionWords.has(phrase[0])) continue;
      const id = idByName.get(phrase.join(''));
      if (id) {
        found.add(id);
        matched = length;
        break;
      }
    }
    index += matched || 1;
  }
  return found.size === 1 ? [...found][0] : null;
}
