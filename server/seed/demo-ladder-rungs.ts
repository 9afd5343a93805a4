import type { LadderBenchmark, LadderRequirement, LadderRung } from '@shared/api/ladder';
import type { Articulation, PatternId } from '@shared/music/index';

const winds = ['woodwind', 'brass', 'percussion'] as LadderRequirement['families'];
const strings = ['strings'] as LadderRequirement['families'];
const twelveMajors = ['C', 'G', 'D', 'A', 'E', 'B', 'F#', 'Db', 'Ab', 'Eb', 'Bb', 'F'];

function requirements(
  rung: number,
  tonics: string[],
  shape: { pattern: PatternId; tempo: number; articulation: Articulation; octaves?: 1 | 2 },
  families: LadderRequirement['families'],
  extra: { mode?: LadderRequirement['mode']; optional?: boolean; suffix?: string } = {},
): LadderRequirement[] {
  const mode = extra.mode ?? 'major';
  return tonics.map((tonic) => ({
    code: `r${rung}-${tonic.toLowerCase().replace('#', 's')}-${mode}${extra.suffix ?? ''}`,
    tonic,
    mode,
    pattern: shape.pattern,
    tempo: shape.tempo,
    articulation: shape.articulation,
    octaves: shape.octaves ?? 1,
    optional: extra.optional ?? false,
    families,
  }));
}

/** The invented Merrow Basin ladder: seven rungs from long tones at ♩ = 60 to all twelve majors. */
export const demoLadderRungs: LadderRung[] = [
  {
    number: 1,
    title: 'Rung 1 — First scales',
    requirements: [
      ...requirements(
        1,
        ['Bb', 'Eb', 'F'],
        { pattern: 'long-tones', tempo: 60, articulation: 'tongued' },
        winds,
      ),
      ...requirements(
        1,
        ['D', 'A', 'G'],
        { pattern: 'long-tones', tempo: 60, articulation: 'tongued' },
        strings,
      ),
    ],
  },
  {
    number: 2,
    title: 'Rung 2 — Scales in motion',
    requirements: [
      ...requirements(
        2,
        ['Bb', 'Eb', 'F'],
        { pattern: 'cycle-broad', tempo: 72, articulation: 'tongued' },
        winds,
      ),
      ...requirements(
        2,
        ['D', 'A', 'G'],
        { pattern: 'cycle-broad', tempo: 72, articulation: 'tongued' },
        strings,
      ),
      ...requirements(
        2,
        ['C'],
        { pattern: 'long-tones', tempo: 60, articulation: 'tongued' },
        null,
        { mode: 'chromatic', optional: true },
      ),
    ],
  },
  {
    number: 3,
    title: 'Rung 3 — Slurs and arpeggios',
    requirements: [
      ...requirements(
        3,
        ['C'],
        { pattern: 'cycle-broad', tempo: 80, articulation: 'slurred' },
        null,
      ),
      ...requirements(
        3,
        ['Ab'],
        { pattern: 'cycle-broad', tempo: 80, articulation: 'slurred' },
        winds,
      ),
      ...requirements(
        3,
        ['Bb'],
        { pattern: 'arpeggio-long', tempo: 80, articulation: 'slurred' },
        winds,
        { suffix: '-arpeggio' },
      ),
      ...requirements(
        3,
        ['E'],
        { pattern: 'cycle-broad', tempo: 80, articulation: 'slurred' },
        strings,
      ),
      ...requirements(
        3,
        ['D'],
        { pattern: 'arpeggio-long', tempo: 80, articulation: 'slurred' },
        strings,
        { suffix: '-arpeggio' },
      ),
    ],
  },
  {
    number: 4,
    title: 'Rung 4 — New keys',
    requirements: [
      ...requirements(
        4,
        ['Db', 'G', 'D'],
        { pattern: 'cycle-broad', tempo: 92, articulation: 'tongue-up-slur-down' },
        winds,
      ),
      ...requirements(
        4,
        ['F', 'Bb'],
        { pattern: 'cycle-broad', tempo: 92, articulation: 'tongue-up-slur-down' },
        strings,
      ),
      ...requirements(
        4,
        ['C'],
        { pattern: 'cycle-broad', tempo: 92, articulation: 'slurred' },
        null,
        { mode: 'chromatic' },
      ),
    ],
  },
  {
    number: 5,
    title: 'Rung 5 — Two octaves',
    requirements: [
      ...requirements(
        5,
        ['Bb', 'F', 'Eb'],
        { pattern: 'cycle-broad', tempo: 100, articulation: 'tongued', octaves: 2 },
        winds,
      ),
      ...requirements(
        5,
        ['D', 'G', 'A'],
        { pattern: 'cycle-broad', tempo: 100, articulation: 'tongued', octaves: 2 },
        strings,
      ),
      ...requirements(
        5,
        ['Ab'],
        { pattern: 'cycle-broad', tempo: 100, articulation: 'tongued', octaves: 2 },
        winds,
        { optional: true },
      ),
    ],
  },
  {
    number: 6,
    title: 'Rung 6 — Brisk cycles',
    requirements: [
      ...requirements(
        6,
        ['Bb', 'Eb', 'F', 'Ab', 'C', 'Db', 'G'],
        { pattern: 'cycle-brisk', tempo: 108, articulation: 'tongue-up-slur-down' },
        winds,
      ),
      ...requirements(
        6,
        ['D', 'A', 'G', 'C', 'F', 'Bb', 'E'],
        { pattern: 'cycle-brisk', tempo: 108, articulation: 'tongue-up-slur-down' },
        strings,
        { suffix: '-strings' },
      ),
      ...requirements(
        6,
        ['C'],
        { pattern: 'cycle-brisk', tempo: 108, articulation: 'slurred', octaves: 2 },
        null,
        { mode: 'chromatic', optional: true },
      ),
    ],
  },
  {
    number: 7,
    title: 'Rung 7 — All twelve',
    requirements: [
      ...requirements(
        7,
        twelveMajors,
        { pattern: 'cycle-brisk', tempo: 120, articulation: 'tongued' },
        null,
      ),
      ...requirements(
        7,
        ['C'],
        { pattern: 'cycle-brisk', tempo: 120, articulation: 'slurred', octaves: 2 },
        null,
        { mode: 'chromatic' },
      ),
      ...requirements(
        7,
        ['C'],
        { pattern: 'cycle-brisk', tempo: 144, articulation: 'slurred', octaves: 2 },
        null,
        { mode: 'chromatic', optional: true, suffix: '-144' },
      ),
    ],
  },
];

const midYear = [
  [4, 0],
  [5, 1],
  [6, 1],
  [7, 2],
  [8, 3],
  [9, 3],
  [10, 4],
  [11, 5],
  [12, 6],
] as const;

/** Mid-year (31 January) and year-end (31 May) benchmarks for grades 4 to 12. */
export const demoBenchmarks: LadderBenchmark[] = midYear.flatMap(([grade, rung]) => [
  { grade, rung, byDate: '2027-01-31' },
  { grade, rung: rung + 1, byDate: '2027-05-31' },
]);
