import type { Key } from './keys';
import { midi, spellAtMidi } from './pitch';
import { arpeggio, scale, type Direction } from './scales';

/** The practice patterns a requirement can ask for, simplest first. */
export const patternIds = ['long-tones', 'arpeggio-long', 'cycle-broad', 'cycle-brisk'] as const;
export type PatternId = (typeof patternIds)[number];

/** One note of a pattern's outline, before articulation: its pitch, length and place. */
export interface OutlineNote {
  note: string;
  beats: number;
  /**
   * Which run of the pattern the note belongs to. A run starts on a turning note (the first
   * tonic, the top of a figure, the tonic shared by the scale and the arpeggio) and goes one way
   * up to the note before the next turn; the last tonic ends the last run.
   */
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

/**
 * Note values in beats: the turning notes (`long`) and the notes run through (`running`).
 * `dotted` is allowed for a turning note when the run after it has an odd number of notes; the
 * brisk cycle allows none, so its eighths always beam in pairs.
 */
const noteValues: Record<PatternId, { long: number; running: number; dotted: boolean }> = {
  'long-tones': { long: 4, running: 4, dotted: false },
  'arpeggio-long': { long: 4, running: 4, dotted: false },
  'cycle-broad': { long: 2, running: 1, dotted: true },
  'cycle-brisk': { long: 1, running: 0.5, dotted: false },
};

const beatsPerBar = 4;

/**
 * The notes of a pattern with octaves, starting from `tonic` (a note with octave). Each figure
 * (the scale, the arpeggio) climbs over one or two octaves and comes back down without
 * repeating its top note. The cycles play the scale and then the arpeggio as one line: the
 * tonic where the scale comes down is the arpeggio's first note (B major: B C# D# E F# G# A# B
 * A# G# F# E D# C# B D# F# B F# D# B).
 *
 * Rhythm (common practice, no source; the way directors write scale sheets):
 * - Only the turning notes take the long value: the first tonic, the top of each figure and the
 *   tonic shared by the scale and the arpeggio. A tonic passed through in the middle of a
 *   two-octave run keeps the running value.
 * - Every turning note starts on a beat, and in the broad cycle on beat 1 or 3, so a half note
 *   never crosses the bar line. When the run after a turning note has an odd number of notes,
 *   the turning note is dotted (broad) or takes the running value (brisk), so the run still
 *   ends on the beat and the brisk cycle's eighths beam in pairs.
 * - The last tonic is held to fill its bar (a whole note after a one-octave broad cycle).
 */
export function patternOutline(
  id: PatternId,
  key: Key,
  tonic: string,
  octaves: 1 | 2,
): OutlineNote[] {
  const line: { note: string; direction: Direction; turns: boolean }[] = [];
  for (const figure of figures[id]) {
    const [up, down] = figureNames(figure, key, octaves);
    const start = line.length === 0 ? midi(tonic) : midi(line[line.length - 1].note);
    const rising = stack(up, start, 'up');
    const falling = stack(down, midi(rising[rising.length - 1]), 'down').slice(1);
    // The second figure starts on the note the first one ended on: one shared tonic.
    if (line.length > 0) line[line.length - 1] = { ...line[line.length - 1], direction: 'up' };
    rising.slice(line.length === 0 ? 0 : 1).forEach((note, index, notes) => {
      const top = index === notes.length - 1;
      line.push({ note, direction: top ? 'down' : 'up', turns: top });
    });
    falling.forEach((note) => line.push({ note, direction: 'down', turns: false }));
    // The last note of a figure turns into the next figure.
    line[line.length - 1].turns = true;
  }
  line[0].turns = true;

  const values = noteValues[id];
  const outline: OutlineNote[] = [];
  let offset = 0;
  let group = -1;
  line.forEach(({ note, direction, turns }, index) => {
    const last = index === line.length - 1;
    if (turns && !last) group += 1;
    let beats = values.running;
    if (last) {
      const inBar = offset % beatsPerBar;
      beats = Math.max(values.long, beatsPerBar - inBar);
      if (inBar + beats > beatsPerBar) beats = beatsPerBar - inBar;
    } else if (turns) {
      const runLength = line.slice(index + 1).findIndex((next) => next.turns);
      beats = turningValue(offset, runLength, values);
    }
    outline.push({ note, beats, group, direction });
    offset += beats;
  });
  return outline;
}

/**
 * The value of a turning note at `offset` followed by `runLength` running notes: the long
 * value when the next turning note then lands where its own long value fits (on a beat; in
 * the broad cycle on beat 1 or 3), else the dotted long value (where allowed and it stays in
 * the bar), else the running value.
 */
function turningValue(
  offset: number,
  runLength: number,
  values: { long: number; running: number; dotted: boolean },
): number {
  const grid = values.long;
  const candidates = [values.long];
  if (values.dotted) candidates.push(values.long + values.running);
  candidates.push(values.running);
  const inBar = offset % beatsPerBar;
  const found = candidates.find((beats) => {
    const next = offset + beats + runLength * values.running;
    return inBar + beats <= beatsPerBar && isMultiple(next, Math.min(grid, beatsPerBar));
  });
  return found ?? values.running;
}

function isMultiple(value: number, unit: number): boolean {
  return Math.abs(value / unit - Math.round(value / unit)) < 1e-9;
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
