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

/**
 * The steps a student climbs toward a requirement: the note names and fingerings, long tones,
 * the arpeggio, the whole pattern slowly in the broad rhythm, the tempo raised through the
 * usual metronome marks (60, 80, 100, 120…) to the required tempo with the required
 * articulation, and last the brisk rhythm when the requirement asks for it. The last step is
 * always the requirement itself. With an instrument, the texts name its written key.
 */
export function practicePlan(
  requirement: PracticeRequirement,
  options: { instrument?: string; startTempo?: number } = {},
): PracticeStep[] {
  const { key, pattern, tempo, articulation, octaves } = requirement;
  checkKey(key);
  if (!(tempo > 0)) throw new Error(`A required tempo must be positive, not ${tempo}.`);
  const instrument = options.instrument === undefined ? undefined : resolve(options.instrument);
  const playedKey = instrument ? writtenKey(key, instrument.id) : key;
  const keyText = instrument
    ? `${keyName(playedKey)} (your written key for concert ${keyName(key)})`
    : keyName(key);
  const warmUpTempo = Math.min(60, tempo);
  const slowTempo = Math.min(options.startTempo ?? warmUpTempo, tempo);
  const target: PatternId = pattern === 'cycle-brisk' ? 'cycle-broad' : pattern;
  const octaveText = octaves === 2 ? ' over two octaves' : '';
  const step = (
    id: string,
    title: string,
    description: string,
    stepPattern: PatternId,
    stepTempo: number,
    stepArticulation: Articulation,
  ): PracticeStep => ({
    id,
    title,
    description,
    pattern: stepPattern,
    tempo: stepTempo,
    articulation: stepArticulation,
    octaves,
  });

  const steps: PracticeStep[] = [
    step(
      'note-names',
      'Learn the notes',
      `Before you play, say the notes of ${keyText} out loud going up and coming down: ` +
        `${scale(playedKey).join(' ')}. Then say them again while you ${fingerWords(instrument)}. ` +
        'When you can do it without stopping, you are ready to play.',
      'long-tones',
      warmUpTempo,
      'tongued',
    ),
  ];
  if (target !== 'long-tones') {
    steps.push(
      step(
        'long-tones',
        'Long tones',
        `Play each note of the scale${octaveText} as a whole note at quarter = ${warmUpTempo}. ` +
          'Take a good breath, keep the sound full and steady to the end of each note, and listen ' +
          'to the pitch.',
        'long-tones',
        warmUpTempo,
        'tongued',
      ),
    );
  }
  if (target === 'cycle-broad') {
    steps.push(
      step(
        'arpeggio',
        'The arpeggio',
        `Play the arpeggio ${arpeggio(playedKey).join(' ')}${octaveText} up and down in whole ` +
          `notes at quarter = ${warmUpTempo}. Hear each note in your head before you play it.`,
        'arpeggio-long',
        warmUpTempo,
        'tongued',
      ),
    );
  }
  steps.push(
    step(
      'slow-pattern',
      target === pattern ? 'The whole pattern, slowly' : 'The whole pattern in the broad rhythm',
      `Play ${patternWords[target]}${octaveText} at quarter = ${slowTempo}, ` +
        `${articulationWords(articulation, instrument)}. Keep every note even; slow and ` +
        'correct is the fastest way to get there.',
      target,
      slowTempo,
      articulation,
    ),
  );
  const climb = [...usualTempos.filter((mark) => mark > slowTempo && mark < tempo), tempo];
  for (const mark of climb.filter((mark) => mark > slowTempo)) {
    const goal = mark === tempo && target === pattern;
    steps.push(
      step(
        `tempo-${mark}`,
        goal ? `Pass-off tempo: quarter = ${mark}` : `Quarter = ${mark}`,
        goal
          ? `Play it at quarter = ${mark}, ${articulationWords(articulation, instrument)}. This is ` +
              'the pass-off tempo: when it feels easy three times in a row, ask your director to hear it.'
          : `Set the metronome to ${mark} and play the pattern again, ` +
              `${articulationWords(articulation, instrument)}. Move on when you can play it ` +
              'cleanly three times in a row.',
        target,
        mark,
        articulation,
      ),
    );
  }
  if (pattern === 'cycle-brisk') {
    steps.push(
      step(
        'brisk',
        `Pass-off: the brisk rhythm at quarter = ${tempo}`,
        `Now play ${patternWords['cycle-brisk']}${octaveText} at quarter = ${tempo}, ` +
          `${articulationWords(articulation, instrument)}. The notes move twice as fast, so ` +
          'stay relaxed and keep the beat steady. When it feels easy, ask your director to hear it.',
        'cycle-brisk',
        tempo,
        articulation,
      ),
    );
  }
  return steps;
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
    return strings ? 'slurring each direction in one bow' : 'slurring up and slurring down';
  }
  if (articulation === 'tongue-up-slur-down') {
    if (mallets) return 'striking the notes going up crisply and the notes coming down smoothly';
    return strings
      ? 'with separate bows going up and one slurred bow coming down'
      : 'tonguing the notes going up and slurring the notes coming down';
  }
  if (mallets) return 'striking every note clearly';
  return strings ? 'with a separate bow for every note' : 'tonguing every note';
}
