import { describe, expect, it } from 'vitest';
import { frequency, midi, pattern, type PatternNote } from '../music';
import { synthTake, type SynthOptions } from '../../tests/support/synth-take';
import { analyseTake, TakeError, type TakeAnalysis } from './index';

const bFlatMajor = { tonic: 'Bb', mode: 'major' } as const;

function listen(notes: PatternNote[], bpm: number, options: SynthOptions = {}): TakeAnalysis {
  const take = synthTake(notes, bpm, options);
  return analyseTake(take.samples, take.sampleRate, notes, bpm);
}

/** Every note 'ok' but those listed, and nothing extra. */
function expectOnlyFlagged(analysis: TakeAnalysis, flagged: Record<number, string>): void {
  const verdicts = analysis.notes.map((note, index) => flagged[index] ?? 'ok');
  expect(analysis.notes.map((note) => note.verdict)).toEqual(verdicts);
}

describe('analyseTake', { timeout: 60_000 }, () => {
  // The pattern a clarinet plays in concert Bb, scale and arpeggio in quarters and eighths.
  const clarinet = pattern('cycle-brisk', bFlatMajor, { instrument: 'clarinet' });

  it('should hear every note of a clean take as ok, at the tempo asked', () => {
    const take = synthTake(clarinet, 100);
    const analysis = analyseTake(take.samples, take.sampleRate, clarinet, 100);
    expectOnlyFlagged(analysis, {});
    expect(analysis.extraNotes).toBe(0);
    expect(analysis.pitchAccuracy).toBe(1);
    expect(analysis.tempo).toBeCloseTo(100, 0);
    // The first note starts after the lead-in and the four-click count-in.
    expect(analysis.notes[0]!.onset).toBeCloseTo(take.firstOnset, 1);
    for (const note of analysis.notes) expect(Math.abs(note.centsOff!)).toBeLessThan(10);
  });

  it('should find a wrong note at its note and nothing else', () => {
    // Index 3 is Eb4; the player plays E4, a semitone sharp.
    const analysis = listen(clarinet, 100, { changes: [{ index: 3, note: 'E4' }] });
    expectOnlyFlagged(analysis, { 3: 'wrong-note' });
    expect(analysis.notes[3]!.heard).toBe('E4');
    expect(analysis.notes[3]!.centsOff).toBeCloseTo(100, -1);
    expect(analysis.extraNotes).toBe(0);
  });

  it('should find a note 40 cents flat as out of tune, with its cents', () => {
    const analysis = listen(clarinet, 100, { changes: [{ index: 5, cents: -40 }] });
    expectOnlyFlagged(analysis, { 5: 'out-of-tune' });
    expect(analysis.notes[5]!.centsOff).toBeGreaterThan(-46);
    expect(analysis.notes[5]!.centsOff).toBeLessThan(-34);
    expect(analysis.notes[5]!.heard).toBe('G4');
  });

  it('should find a missed note and keep the notes after it paired', () => {
    const analysis = listen(clarinet, 100, { changes: [{ index: 9, skip: true }] });
    expectOnlyFlagged(analysis, { 9: 'missed' });
    expect(analysis.notes[9]).toMatchObject({ heard: null, centsOff: null, onset: null });
    expect(analysis.extraNotes).toBe(0);
  });

  it('should count an extra note and flag nothing', () => {
    const analysis = listen(clarinet, 100, { changes: [{ index: 12, extraAfter: 'Eb4' }] });
    expectOnlyFlagged(analysis, {});
    expect(analysis.extraNotes).toBe(1);
  });

  it('should hear a tempo 8 % slow as the tempo kept', () => {
    const analysis = listen(clarinet, 100, { tempoShare: 0.92 });
    expectOnlyFlagged(analysis, {});
    expect(analysis.tempo).toBeGreaterThan(90.5);
    expect(analysis.tempo).toBeLessThan(93.5);
  });

  it('should follow a player who starts late and drifts slower', () => {
    const take = synthTake(clarinet, 100, { leadIn: 4.2, driftTo: 0.85 });
    const analysis = analyseTake(take.samples, take.sampleRate, clarinet, 100);
    expectOnlyFlagged(analysis, {});
    expect(analysis.notes[0]!.onset).toBeCloseTo(take.firstOnset, 1);
    // The kept tempo lies between the start (100) and the end (85).
    expect(analysis.tempo).toBeGreaterThan(85);
    expect(analysis.tempo).toBeLessThan(100);
  });

  it('should cut a slurred run with no gaps at its pitch changes', () => {
    const slurred = pattern('cycle-brisk', bFlatMajor, {
      instrument: 'flute',
      articulation: 'slurred',
    });
    const take = synthTake(slurred, 120, { changes: [{ index: 4, cents: -40 }] });
    const analysis = analyseTake(take.samples, take.sampleRate, slurred, 120);
    expectOnlyFlagged(analysis, { 4: 'out-of-tune' });
    expect(analysis.extraNotes).toBe(0);
  });

  it('should hear low brass whose fundamental is weaker than its overtones', () => {
    const tuba = pattern('cycle-broad', bFlatMajor, { instrument: 'tuba' });
    // Harmonics 2–4 each stronger than the fundamental, as in a tuba's low register.
    const analysis = listen(tuba, 80, { harmonics: [0.2, 1, 0.9, 0.6, 0.35, 0.2] });
    expectOnlyFlagged(analysis, {});
    expect(analysis.tempo).toBeCloseTo(80, 0);
  });

  it('should hear the high register of a piccolo in its own octave', () => {
    // Concert Bb5 to Bb6 (932–1865 Hz): periods of a few samples at a low working rate.
    const piccolo = pattern('cycle-brisk', bFlatMajor, { instrument: 'piccolo' });
    const analysis = listen(piccolo, 100, { vibrato: { cents: 10, hz: 5.5 } });
    expectOnlyFlagged(analysis, {});
    expect(analysis.extraNotes).toBe(0);
  });

  it('should measure cents against the A4 it is given', () => {
    const flute = pattern('arpeggio-long', bFlatMajor, { instrument: 'flute' });
    const take = synthTake(flute, 120, { a4: 442 });
    const at442 = analyseTake(take.samples, take.sampleRate, flute, 120, { a4: 442 });
    const at440 = analyseTake(take.samples, take.sampleRate, flute, 120);
    expectOnlyFlagged(at442, {});
    // 442 Hz is 1200·log2(442/440) ≈ 7.85 cents above 440 Hz (ISO 16 reference).
    const shift = 1200 * Math.log2(442 / 440);
    for (const [i, note] of at440.notes.entries()) {
      expect(note.centsOff! - at442.notes[i]!.centsOff!).toBeCloseTo(shift, 0);
    }
  });

  it('should judge by the tolerance it is given', () => {
    const analysis = (tolerance?: number) => {
      const take = synthTake(clarinet, 100, { changes: [{ index: 2, cents: 20 }] });
      return analyseTake(take.samples, take.sampleRate, clarinet, 100, {
        toleranceCents: tolerance,
      });
    };
    expect(analysis().notes[2]!.verdict).toBe('ok');
    expect(analysis(10).notes[2]!.verdict).toBe('out-of-tune');
  });

  it('should hear a take at 48 kHz and at 16 kHz alike', () => {
    for (const sampleRate of [48_000, 16_000]) {
      const analysis = listen(clarinet, 100, { sampleRate, changes: [{ index: 6, cents: 35 }] });
      expectOnlyFlagged(analysis, { 6: 'out-of-tune' });
    }
  });
});

describe('analyseTake on recordings it cannot use', { timeout: 60_000 }, () => {
  const notes = pattern('arpeggio-long', bFlatMajor, { instrument: 'trumpet' });
  const rate = 44_100;

  function problem(samples: Float32Array, sampleRate = rate): string {
    try {
      analyseTake(samples, sampleRate, notes, 120);
    } catch (error) {
      if (error instanceof TakeError) return `${error.problem}: ${error.message}`;
      throw error;
    }
    return 'analysed';
  }

  it('should say no notes were heard in silence', () => {
    expect(problem(new Float32Array(rate * 5))).toMatch(/^no-notes: No notes heard/);
  });

  it('should say no notes were heard in noise', () => {
    const noise = new Float32Array(rate * 5).map(() => 0.3 * (Math.random() * 2 - 1));
    expect(problem(noise)).toMatch(/^no-notes/);
  });

  it('should say no notes were heard in speech-like sound', () => {
    // A stand-in for speech (no recording of a voice is available offline): syllables of a
    // glottal pulse train whose pitch glides as intonation does (about 100–220 Hz), between
    // bursts of unvoiced noise for the consonants.
    const speech = new Float32Array(rate * 6);
    let phase = 0;
    for (let n = 0; n < speech.length; n += 1) {
      const t = n / rate;
      const syllable = t % 0.3;
      if (syllable < 0.06) {
        speech[n] = 0.1 * (Math.random() * 2 - 1);
      } else {
        const hz = 150 + 60 * Math.sin(2 * Math.PI * 1.3 * t) + 120 * (syllable - 0.18);
        phase += hz / rate;
        speech[n] = 0.3 * ((phase % 1) - 0.5) * Math.sin((Math.PI * (syllable - 0.06)) / 0.24);
      }
    }
    expect(problem(speech)).toMatch(/^no-notes/);
  });

  it('should refuse a take longer than ten minutes', () => {
    expect(problem(new Float32Array(16_000 * 60 * 20), 16_000)).toBe(
      'too-long: The recording is too long: 10 minutes at most.',
    );
  });

  it('should refuse 8 kHz and 192 kHz with the rates it hears', () => {
    expect(problem(new Float32Array(8_000), 8_000)).toMatch(
      /^sample-rate: .*8000 Hz.*16 to 96 kHz/,
    );
    expect(problem(new Float32Array(192_000), 192_000)).toMatch(/^sample-rate: .*192000 Hz/);
  });

  it('should refuse an empty or damaged recording', () => {
    expect(problem(new Float32Array(0))).toBe('empty: The recording is empty.');
    const damaged = new Float32Array(rate).fill(0.1);
    damaged[500] = Number.NaN;
    expect(problem(damaged)).toMatch(/^not-audio/);
  });

  it('should still analyse a take whose notes are in tune (the rejections are not the rule)', () => {
    const take = synthTake(notes, 120);
    expect(problem(take.samples)).toBe('analysed');
    // frequency() is ISO 16 equal temperament: A4 = 440 Hz, so Bb4 = 440·2^(1/12).
    expect(frequency('Bb4')).toBeCloseTo(466.16, 2);
    expect(midi(notes[0]!.note)).toBeLessThan(midi('Bb4') + 1);
  });
});
