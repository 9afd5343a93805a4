import type { Key } from './keys';
import { midi, parseNote, spellAtMidi } from './pitch';
import { arpeggio, scale, type Direction } from './scales';

/** The practice patterns a requirement can ask for. */
export type PatternId = 'long-tones' | 'arpeggio-long' | 'cycle-broad' | 'cycle-brisk';

/** Every practice pattern, simplest first. */
export const patternIds: readonly PatternId[] = [
  'long-tones',
  'arpeggio-long',
  'cycle-broad',
  'cycle-brisk',
];

/** One note of a pattern's outline, before articulation: its pitch, length and place. */
export interface OutlineNote {
  note: string;
  beats: number;
  /** Which run of the pattern the note belongs to; each run goes one way. */
  group: number;
  direction: Direction;
}

type Figure = 'scale' | 'arpeggio';

const figures: Record<PatternId, Figure[]> = {
  'long-tones': ['scale'],
  'arpeggio-long': ['arpeggio'],
  'cycle-broad': ['scale', 'arpeggio'],
  'cycle-brisk': ['scale', 'arpeggio'],
};

/** Beats of a tonic and of every other note: whole notes, half and quarter, quarter and eighth. */
const noteValues: Record<PatternId, { tonic: number; other: number }> = {
  'long-tones': { tonic: 4, other: 4 },
  'arpeggio-long': { tonic: 4, other: 4 },
  'cycle-broad': { tonic: 2, other: 1 },
  'cycle-brisk': { tonic: 1, other: 0.5 },
};

/**
 * The notes of a pattern with octaves, starting from `tonic` (a note with octave). Each figure
 * (the scale, the arpeggio) climbs over one or two octaves and comes back down without
 * repeating its top note; the cycles play the scale, then the arpeggio from the tonic again.
 * Every tonic takes the tonic's note value.
 */
export function patternOutline(
  id: PatternId,
  key: Key,
  tonic: string,
  octaves: 1 | 2,
): OutlineNote[] {
  const values = noteValues[id];
  const outline: OutlineNote[] = [];
  for (const figure of figures[id]) {
    const [up, down] = figureNames(figure, key, octaves);
    const rising = stack(up, midi(tonic), 'up');
    const falling = stack(down, midi(rising[rising.length - 1]), 'down').slice(1);
    for (const [direction, notes] of [
      ['up', rising],
      ['down', falling],
    ] as const) {
      const group = outline.length === 0 ? 0 : outline[outline.length - 1].group + 1;
      for (const note of notes) {
        const isTonic = sameLetterAndAccidental(note, key.tonic);
        outline.push({ note, beats: isTonic ? values.tonic : values.other, group, direction });
      }
    }
  }
  return outline;
}

function figureNames(figure: Figure, key: Key, octaves: 1 | 2): [string[], string[]] {
  const up = figure === 'scale' ? scale(key, 'up') : arpeggio(key);
  const down = figure === 'scale' ? scale(key, 'down') : [...arpeggio(key)].reverse();
  return octaves === 1
    ? [up, down]
    : [
        [...up, ...up.slice(1)],
        [...down, ...down.slice(1)],
      ];
}

/**
 * Gives each name an octave: the first at `start`, every next one the nearest above (going
 * up) or below (going down) the note before it.
 */
function stack(names: string[], start: number, direction: Direction): string[] {
  let previous = start;
  return names.map((name, index) => {
    let value = nearestMidi(name, previous);
    if (index > 0 && direction === 'up' && value <= previous) value += 12;
    if (index > 0 && direction === 'down' && value >= previous) value -= 12;
    previous = value;
    return spellAtMidi(name, value);
  });
}

/** The MIDI number of the octave of `name` closest to `target`. */
function nearestMidi(name: string, target: number): number {
  const inOctaveFour = midi(`${name}4`);
  return inOctaveFour + 12 * Math.round((target - inOctaveFour) / 12);
}

function sameLetterAndAccidental(note: string, tonic: string): boolean {
  const a = parseNote(note);
  const b = parseNote(tonic);
  return a.letter === b.letter && a.alteration === b.alteration;
}
