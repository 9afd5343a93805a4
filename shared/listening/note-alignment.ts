import type { HeardNote } from './note-segments';

/** One expected note for alignment: its MIDI number and where it falls, in beats from the start. */
export interface ExpectedNote {
  midi: number;
  beat: number;
}

/** The pairing of expected notes with heard notes: `heardIndex[i]` or -1 for a missed note. */
export interface Alignment {
  heardIndex: number[];
  /** How many heard notes were paired with nothing. */
  extra: number;
}

/** Cost of an expected note that nothing heard was paired with. */
const missedCost = 1.5;
/** Cost of a heard note that is paired with no expected note. */
const extraCost = 1.5;
/** The most a wrong pitch costs, so that a wrong note in its place still pairs with its note. */
const pitchCostCap = 2.5;
/** Weight of timing in the second pass. */
const timingWeight = 0.8;

/**
 * Pairs heard notes with expected notes by a global sequence alignment (Needleman and Wunsch,
 * J. Mol. Biol. 48, 1970): dynamic programming over both sequences in order, where each step
 * pairs two notes, skips an expected note (missed) or skips a heard note (extra).
 *
 * Why not plain dynamic time warping: DTW must give every element of both sequences a partner,
 * so a missed note would be forced onto a neighbour and an extra note would stretch another; the
 * alignment with skips is the same recurrence with two more moves, and keeps DTW's tolerance of
 * any start time and any tempo because it never looks at absolute time in its first pass.
 *
 * Two passes. The first aligns on pitch alone. The onsets it pairs give a robust tempo and start
 * (see {@link fitTempo}); the second pass adds a capped timing cost against that line, which
 * decides between equal-pitch choices (which of two repeated tonics was missed) and is capped so
 * that a player who drifts in tempo is not pulled apart.
 */
export function alignNotes(expected: ExpectedNote[], heard: HeardNote[]): Alignment {
  const first = align(expected, heard, () => 0);
  const fit = fitTempo(expected, heard, first.heardIndex);
  if (!fit) return first;
  return align(expected, heard, (i, j) => {
    const predicted = fit.start + expected[i]!.beat * fit.secondsPerBeat;
    const scale = Math.max(2 * fit.secondsPerBeat, 0.5);
    return timingWeight * Math.min(1, Math.abs(heard[j]!.onset - predicted) / scale);
  });
}

function align(
  expected: ExpectedNote[],
  heard: HeardNote[],
  timingCost: (i: number, j: number) => number,
): Alignment {
  const n = expected.length;
  const m = heard.length;
  const width = m + 1;
  const cost = new Float64Array((n + 1) * width);
  // 0 = pair, 1 = missed (skip expected), 2 = extra (skip heard)
  const move = new Uint8Array((n + 1) * width);
  for (let j = 1; j <= m; j += 1) {
    cost[j] = j * extraCost;
    move[j] = 2;
  }
  for (let i = 1; i <= n; i += 1) {
    cost[i * width] = i * missedCost;
    move[i * width] = 1;
    for (let j = 1; j <= m; j += 1) {
      const pair =
        cost[(i - 1) * width + j - 1]! +
        pitchCost(heard[j - 1]!.midi - expected[i - 1]!.midi) +
        timingCost(i - 1, j - 1);
      const missed = cost[(i - 1) * width + j]! + missedCost;
      const extra = cost[i * width + j - 1]! + extraCost;
      let best = pair;
      let chosen = 0;
      if (missed < best) {
        best = missed;
        chosen = 1;
      }
      if (extra < best) {
        best = extra;
        chosen = 2;
      }
      cost[i * width + j] = best;
      move[i * width + j] = chosen;
    }
  }
  const heardIndex = new Array<number>(n).fill(-1);
  let extra = 0;
  let i = n;
  let j = m;
  while (i > 0 || j > 0) {
    const chosen = move[i * width + j];
    if (chosen === 0) {
      heardIndex[i - 1] = j - 1;
      i -= 1;
      j -= 1;
    } else if (chosen === 1) {
      i -= 1;
    } else {
      extra += 1;
      j -= 1;
    }
  }
  return { heardIndex, extra };
}

/** Cheap within a quarter tone, rising with the distance, capped at a few semitones. */
function pitchCost(semitones: number): number {
  const distance = Math.abs(semitones);
  if (distance <= 0.5) return distance;
  return Math.min(pitchCostCap, 0.5 + 0.6 * (distance - 0.5));
}

/**
 * The tempo and start a player kept: the Theil–Sen line (the median of the slopes between every
 * two paired notes; H. Theil 1950, P. K. Sen 1968) through the paired notes' onsets against their
 * beats. A median keeps one early or late note, or a pairing gone wrong, from moving the line.
 * Undefined with fewer than three paired notes.
 */
export function fitTempo(
  expected: ExpectedNote[],
  heard: HeardNote[],
  heardIndex: number[],
): { secondsPerBeat: number; start: number } | undefined {
  const points: { beat: number; time: number }[] = [];
  heardIndex.forEach((j, i) => {
    if (j >= 0) points.push({ beat: expected[i]!.beat, time: heard[j]!.onset });
  });
  if (points.length < 3) return undefined;
  const slopes: number[] = [];
  for (let a = 0; a < points.length; a += 1) {
    for (let b = a + 1; b < points.length; b += 1) {
      const beats = points[b]!.beat - points[a]!.beat;
      if (beats > 0) slopes.push((points[b]!.time - points[a]!.time) / beats);
    }
  }
  if (slopes.length === 0) return undefined;
  const secondsPerBeat = middle(slopes);
  if (!(secondsPerBeat > 0)) return undefined;
  const start = middle(points.map(({ beat, time }) => time - beat * secondsPerBeat));
  return { secondsPerBeat, start };
}

function middle(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const half = Math.floor(sorted.length / 2);
  return sorted.length % 2 === 1 ? sorted[half]! : (sorted[half - 1]! + sorted[half]!) / 2;
}
