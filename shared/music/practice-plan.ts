import { findInstrument } from './instruments';
import type { InstrumentSpec } from './instrument-data';
import { checkKey, keyName, type Key } from './keys';
import type { PatternId } from './pattern-shapes';
import type { Articulation } from './patterns';
import { arpeggio, scale } from './scales';
import { writtenKey } from './transposition';

/** What a student must play: the parts of a ladder requirement the practice plan needs. */
export interface PracticeRequirement {
  key: Key;
  pattern: PatternId;
  tempo: number;
  articulation: Articulation;
  octaves: 1 | 2;
}

/** One step of a practice plan. */
export interface PracticeStep {
  id: string;
  title: string;
  description: string;
  pattern: PatternId;
  tempo: number;
  articulation: Articulation;
  octaves: 1 | 2;
}

/** Metronome marks teachers usually climb through (common practice, no source). */
const usualTempos = [60, 80, 100, 120, 144, 160];

const patternWords: Record<PatternId, string> = {
  'long-tones': 'the scale up and down in whole notes',
  'arpeggio-long': 'the arpeggio up and down in whole notes',
  'cycle-broad': 'the scale up and down, then the arpeggio, in half notes and quarter notes',
  'cycle-brisk': 'the scale up and down, then the arpeggio, in quarter notes and eighth notes',
};

/** The slowest metronome mark a plan asks for (most metronomes start at 40). */
const slowestMark = 40;

/**
 * The steps a student climbs toward a requirement: the note names and fingerings (with the
 * descending form named where it differs, as melodic minor comes down as natural minor), long
 * tones told for the instrument (breath for winds, whole bows for strings, a roll for mallets,
 * which cannot sustain), the arpeggio, the whole pattern slowly in the broad rhythm, the tempo
 * raised through the usual metronome marks (60, 80, 100, 120…) with the required articulation.
 * A brisk requirement climbs the broad rhythm to the required tempo, then brings the brisk
 * rhythm in at half that tempo, where its eighths move as fast as the broad quarters did, and
 * climbs again. The last step is always the requirement itself, titled as the pass-off, even
 * for a requirement slower than 60. With an instrument, the texts name its written key.
 */
export function practicePlan(
  requirement: PracticeRequirement,
  options: { instrument?: string; startTempo?: number } = {},
): PracticeStep[] {
  const plan = planContext(requirement, options);
  return [...openingSteps(plan), ...climbingSteps(plan), ...briskSteps(plan)];
}

/** What every step of one plan is worked out from. */
interface PlanContext {
  requirement: PracticeRequirement;
  instrument: InstrumentSpec | undefined;
  /** The key the student reads: the written key with an instrument, else concert. */
  playedKey: Key;
  keyText: string;
  warmUpTempo: number;
  slowTempo: number;
  /** The pattern climbed in the broad rhythm: a brisk requirement climbs its broad form first. */
  target: PatternId;
  octaveText: string;
  /** How to articulate, in the instrument's words. */
  how: string;
}

const passOffWords =
  'This is the pass-off tempo: when it feels easy three times in a row, ask your director to hear it.';

function planContext(
  requirement: PracticeRequirement,
  options: { instrument?: string; startTempo?: number },
): PlanContext {
  const { key, pattern, tempo, articulation, octaves } = requirement;
  checkKey(key);
  if (!(tempo > 0)) throw new Error(`A required tempo must be positive, not ${tempo}.`);
  const instrument = options.instrument === undefined ? undefined : resolve(options.instrument);
  const playedKey = instrument ? writtenKey(key, instrument.id) : key;
  const warmUpTempo = Math.min(60, tempo);
  return {
    requirement,
    instrument,
    playedKey,
    keyText: instrument
      ? `${keyName(playedKey)} (your written key for concert ${keyName(key)})`
      : keyName(key),
    warmUpTempo,
    slowTempo: Math.min(options.startTempo ?? warmUpTempo, tempo),
    target: pattern === 'cycle-brisk' ? 'cycle-broad' : pattern,
    octaveText: octaves === 2 ? ' over two octaves' : '',
    how: articulationWords(articulation, instrument),
  };
}

function step(
  plan: PlanContext,
  fields: Omit<PracticeStep, 'octaves' | 'articulation'> & { articulation?: Articulation },
): PracticeStep {
  return {
    ...fields,
    articulation: fields.articulation ?? plan.requirement.articulation,
    octaves: plan.requirement.octaves,
  };
}

/** The notes, then long tones and the arpeggio where the pattern goes beyond them. */
function openingSteps(plan: PlanContext): PracticeStep[] {
  const { instrument, playedKey, keyText, warmUpTempo, target, octaveText } = plan;
  const steps = [
    step(plan, {
      id: 'note-names',
      title: 'Learn the notes',
      description:
        `Before you play, say the notes of ${keyText} out loud ${noteNamesText(playedKey)}. ` +
        `Then say them again while you ${fingerWords(instrument)}. ` +
        'When you can do it without stopping, you are ready to play.',
      pattern: 'long-tones',
      tempo: warmUpTempo,
      articulation: 'tongued',
    }),
  ];
  if (target !== 'long-tones') {
    steps.push(
      step(plan, {
        id: 'long-tones',
        title: 'Long tones',
        description:
          `Play each note of the scale${octaveText} as a whole note at quarter = ${warmUpTempo}. ` +
          longToneWords(instrument),
        pattern: 'long-tones',
        tempo: warmUpTempo,
        articulation: 'tongued',
      }),
    );
  }
  if (target === 'cycle-broad') {
    steps.push(
      step(plan, {
        id: 'arpeggio',
        title: 'The arpeggio',
        description:
          `Play the arpeggio ${arpeggio(playedKey).join(' ')}${octaveText} up and down in whole ` +
          `notes at quarter = ${warmUpTempo}. Hear each note in your head before you play it.`,
        pattern: 'arpeggio-long',
        tempo: warmUpTempo,
        articulation: 'tongued',
      }),
    );
  }
  return steps;
}

/** The whole pattern slowly, then up through the usual metronome marks. */
function climbingSteps(plan: PlanContext): PracticeStep[] {
  const { slowTempo, target, octaveText, how } = plan;
  const { pattern, tempo } = plan.requirement;
  const slowIsGoal = slowTempo === tempo && target === pattern;
  const steps = [
    step(plan, {
      id: 'slow-pattern',
      title: slowIsGoal
        ? `Pass-off tempo: quarter = ${tempo}`
        : target === pattern
          ? 'The whole pattern, slowly'
          : 'The whole pattern in the broad rhythm',
      description:
        `Play ${patternWords[target]}${octaveText} at quarter = ${slowTempo}, ${how}. ` +
        (slowIsGoal
          ? `Keep every note even. ${passOffWords}`
          : 'Keep every note even; slow and correct is the fastest way to get there.'),
      pattern: target,
      tempo: slowTempo,
    }),
  ];
  for (const mark of climbFrom(slowTempo, tempo)) {
    const goal = mark === tempo && target === pattern;
    steps.push(
      step(plan, {
        id: `tempo-${mark}`,
        title: goal ? `Pass-off tempo: quarter = ${mark}` : `Quarter = ${mark}`,
        description: goal
          ? `Play it at quarter = ${mark}, ${how}. ${passOffWords}`
          : `Set the metronome to ${mark} and play the pattern again, ${how}. Move on when you ` +
            'can play it cleanly three times in a row.',
        pattern: target,
        tempo: mark,
      }),
    );
  }
  return steps;
}

/** For a brisk requirement: the brisk rhythm brought in at half the tempo, and climbed. */
function briskSteps(plan: PlanContext): PracticeStep[] {
  const { octaveText, how } = plan;
  const { pattern, tempo } = plan.requirement;
  if (pattern !== 'cycle-brisk') return [];
  // Eighths at half the tempo move as fast as the quarters the broad rhythm just reached.
  const entry = Math.min(tempo, Math.max(slowestMark, Math.round(tempo / 2)));
  const brisk = [entry, ...climbFrom(entry, tempo)];
  return brisk.map((mark, index) => {
    const goal = mark === tempo;
    return step(plan, {
      id: goal ? 'brisk' : `brisk-${mark}`,
      title: goal
        ? `Pass-off: the brisk rhythm at quarter = ${mark}`
        : `The brisk rhythm at quarter = ${mark}`,
      description:
        (index === 0
          ? `Now play ${patternWords['cycle-brisk']}${octaveText} at quarter = ${mark}, ${how}. ` +
            `The eighth notes move as fast as the quarter notes did at quarter = ${mark * 2}, ` +
            'so the notes feel the same while the beat is slower. '
          : `Set the metronome to ${mark} and play the brisk rhythm again, ${how}. `) +
        (goal ? passOffWords : 'Move on when you can play it cleanly three times in a row.'),
      pattern: 'cycle-brisk',
      tempo: mark,
    });
  });
}

/** The usual metronome marks above `from` and below `to`, then `to` itself when above `from`. */
function climbFrom(from: number, to: number): number[] {
  return [...usualTempos.filter((mark) => mark > from && mark < to), to].filter(
    (mark) => mark > from,
  );
}

/**
 * 'going up and coming down: B C# D# …', or for a scale that comes down another way (melodic
 * minor comes down as natural minor) 'going up: E F# G A B C# D# E, and coming down: E D C B A
 * G F# E'.
 */
function noteNamesText(key: Key): string {
  const up = scale(key, 'up');
  const down = scale(key, 'down');
  const same = down.join(' ') === [...up].reverse().join(' ');
  return same
    ? `going up and coming down: ${up.join(' ')}`
    : `going up: ${up.join(' ')}, and coming down, which is different: ${down.join(' ')}`;
}

/**
 * How to play a long tone on the instrument (common practice, no source): winds sustain on the
 * breath, strings on whole bows at a steady contact point, and mallet instruments, which cannot
 * sustain, hold a note with a roll (or even repeated strokes for a beginner).
 */
function longToneWords(instrument: InstrumentSpec | undefined): string {
  if (instrument?.family === 'strings') {
    return (
      'Use a whole bow for each note, from the frog to the tip and back, keeping the bow at ' +
      'the same contact point between the bridge and the fingerboard and the weight even, and ' +
      'listen to the pitch.'
    );
  }
  if (instrument?.family === 'percussion') {
    return (
      'A bar cannot hold a note, so roll each one: even, alternating strokes from both mallets ' +
      'for the whole note (or steady eighth notes if the roll is new to you), striking the ' +
      'middle of the bar, and listen to the pitch.'
    );
  }
  return (
    'Take a good breath, keep the sound full and steady to the end of each note on a steady ' +
    'stream of air, and listen to the pitch.'
  );
}

function resolve(nameOrId: string): InstrumentSpec {
  const instrument = findInstrument(nameOrId);
  if (!instrument) throw new Error(`Unknown instrument "${nameOrId}".`);
  return instrument;
}

function fingerWords(instrument: InstrumentSpec | undefined): string {
  if (!instrument) return 'finger each note without playing';
  if (instrument.id === 'trombone') return 'move the slide to each position without playing';
  if (instrument.family === 'strings') return 'place your fingers for each note without bowing';
  if (instrument.family === 'percussion') return 'touch each bar with your mallet without striking';
  return 'finger each note without playing';
}

function articulationWords(articulation: Articulation, instrument?: InstrumentSpec): string {
  const strings = instrument?.family === 'strings';
  const mallets = instrument?.family === 'percussion';
  if (articulation === 'slurred') {
    if (mallets) return 'as smoothly connected as you can';
    return strings
      ? 'slurring the notes of each marked slur in one bow and changing bow where a new slur ' +
          'begins (no more than a bar in one bow)'
      : 'slurring up and slurring down';
  }
  if (articulation === 'tongue-up-slur-down') {
    if (mallets) return 'striking the notes going up crisply and the notes coming down smoothly';
    return strings
      ? 'with separate bows going up and slurred bows coming down, changing bow where a new ' +
          'slur begins (no more than a bar in one bow)'
      : 'tonguing the notes going up and slurring the notes coming down';
  }
  if (mallets) return 'striking every note clearly';
  return strings ? 'with a separate bow for every note' : 'tonguing every note';
}
