import { PitchDetector } from 'pitchy';
import { analyseTake } from '@shared/listening';
import { pattern, type PatternNote } from '@shared/music';
import { synthTake } from '../support/synth-take';
import { figure, percentile, type BenchFigure } from './bench-figure';

/**
 * Analysing a take of `seconds` at 44.1 kHz (a clarinet's concert Bb scale-and-arpeggio cycle,
 * repeated, with harmonics, vibrato, breath noise, a room and a count-in), against one pass of
 * the pitch detector alone over the same samples: pitchy's McLeod pitch method on consecutive
 * 2,048-sample windows, every sample through it once. Targets: under 4× that pass, and under 1 s.
 */
export async function benchListening(options: {
  seconds: number;
  runs: number;
}): Promise<BenchFigure[]> {
  const bpm = 100;
  const cycle = pattern('cycle-brisk', { tonic: 'Bb', mode: 'major' }, { instrument: 'clarinet' });
  const cycleSeconds = (cycle.reduce((sum, note) => sum + note.beats, 0) * 60) / bpm;
  // Whole cycles that end (with a 1.2 s room tail) inside the take, then silence to its length.
  const notes: PatternNote[] = [];
  while (
    (notes.length / cycle.length + 1) * cycleSeconds + 0.5 + 4 * (60 / bpm) + 1.2 <=
    options.seconds
  ) {
    notes.push(...cycle);
  }
  const take = synthTake(notes, bpm, { leadIn: 0.5 });
  const samples = new Float32Array(Math.round(options.seconds * take.sampleRate));
  samples.set(take.samples.subarray(0, samples.length));

  const detector = PitchDetector.forFloat32Array(2048);
  const onePass = () => {
    let heard = 0;
    for (let start = 0; start + 2048 <= samples.length; start += 2048) {
      if (detector.findPitch(samples.subarray(start, start + 2048), take.sampleRate)[1] > 0.9)
        heard += 1;
    }
    return heard;
  };
  const analyse = () => analyseTake(samples, take.sampleRate, notes, bpm);

  // Warm both up, then alternate so that the machine's phases fall on both alike.
  onePass();
  const check = analyse();
  const passes: number[] = [];
  const analyses: number[] = [];
  for (let run = 0; run < options.runs; run += 1) {
    let start = performance.now();
    onePass();
    passes.push(performance.now() - start);
    start = performance.now();
    analyse();
    analyses.push(performance.now() - start);
  }
  const pass = percentile(passes, 50);
  const analysis = percentile(analyses, 50);
  const ok = check.notes.filter((note) => note.verdict === 'ok').length;
  const seconds = `${Math.round(samples.length / take.sampleRate)} s`;
  return [
    figure(
      `analyse a ${seconds} take, against 4× one pitchy pass (${pass.toFixed(0)} ms)`,
      analysis,
      4 * pass,
      `target ≤ 1×; median of ${options.runs}; ${ok} of ${notes.length} notes ok, tempo ${check.tempo}`,
    ),
    figure(`analyse a ${seconds} take, against 1 s`, analysis, 1000, 'target ≤ 1× (a fixed limit)'),
  ];
}
