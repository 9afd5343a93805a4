import { frequency, midi, type PatternNote } from '@shared/music';

/** A change planted in a synthesised take at one expected note (by its index). */
export interface PlantedChange {
  index: number;
  /** Play this note instead (concert pitch). */
  note?: string;
  /** Play the note this many cents off (negative = flat). */
  cents?: number;
  /** Leave the note out (its time stays silent). */
  skip?: boolean;
  /** Play this extra note after the expected one, half a beat long, inside the same time. */
  extraAfter?: string;
}

/** How to synthesise a take of a pattern. */
export interface SynthOptions {
  sampleRate?: number;
  a4?: number;
  /** Seconds of room noise before the count-in. Default 0.5. */
  leadIn?: number;
  /** Clicks of a count-in, one per beat, before the first note. Default 4. */
  countIn?: number;
  /** The tempo actually played as a share of the asked one (0.92 = 8 % slow). Default 1. */
  tempoShare?: number;
  /** The tempo at the end as a share of the tempo at the start (a player who drifts). Default 1. */
  driftTo?: number;
  /**
   * Amplitudes of harmonics 1, 2, 3…; default a reed-like spectrum whose second and third
   * harmonics are stronger than the fundamental.
   */
  harmonics?: number[];
  /** Vibrato depth in cents (peak) and rate in hertz. Default 25 cents at 5.5 Hz. */
  vibrato?: { cents: number; hz: number };
  /** Breath noise as a share of the tone's level (white noise following the note). Default 0.08. */
  breath?: number;
  /** Whether to add a room (Schroeder reverberator). Default true. */
  room?: boolean;
  /** Seconds between tongued notes. Default 0.04. */
  tongueGap?: number;
  /** Force every note slurred to the one before (no gaps at all). */
  allSlurred?: boolean;
  changes?: PlantedChange[];
  seed?: number;
}

/**
 * Synthesises a take of a pattern whose answer is known: each note a sum of harmonics of its
 * concert frequency (ISO 16 equal temperament through `frequency()`), with vibrato, an attack
 * and release, breath noise and a room, after a count-in of clicks. Slurred notes join the
 * previous note with no gap and a continuous phase, as a slur does.
 */
export function synthTake(
  notes: PatternNote[],
  bpm: number,
  options: SynthOptions = {},
): { samples: Float32Array; sampleRate: number; firstOnset: number } {
  const sampleRate = options.sampleRate ?? 44_100;
  const a4 = options.a4 ?? 440;
  const harmonics = options.harmonics ?? [0.35, 1, 0.8, 0.45, 0.3, 0.15, 0.1];
  const vibrato = options.vibrato ?? { cents: 25, hz: 5.5 };
  const breath = options.breath ?? 0.08;
  const tongueGap = options.tongueGap ?? 0.04;
  const tempoShare = options.tempoShare ?? 1;
  const driftTo = options.driftTo ?? 1;
  const random = mulberry32(options.seed ?? 7);
  const changes = new Map((options.changes ?? []).map((change) => [change.index, change]));

  const beatSeconds = 60 / (bpm * tempoShare);
  const leadIn = options.leadIn ?? 0.5;
  const countIn = options.countIn ?? 4;
  const firstOnset = leadIn + countIn * beatSeconds;
  const totalBeats = notes.reduce((sum, note) => sum + note.beats, 0);
  // With drift the beat's length moves linearly from beatSeconds to beatSeconds / driftTo.
  const timeOfBeat = (beat: number) => {
    const share = beat / totalBeats;
    const endLength = beatSeconds / driftTo;
    return firstOnset + beat * (beatSeconds + ((endLength - beatSeconds) * share) / 2);
  };
  const length = Math.ceil((timeOfBeat(totalBeats) + 1.2) * sampleRate);
  const tone = new Float32Array(length);

  // Events: each sounding note with start, end, frequency and whether it is slurred in.
  const events: { start: number; end: number; hz: number; slurred: boolean }[] = [];
  let beat = 0;
  notes.forEach((note, index) => {
    const change = changes.get(index);
    const start = timeOfBeat(beat);
    const end = timeOfBeat(beat + note.beats);
    beat += note.beats;
    if (change?.skip) return;
    const slurred = (options.allSlurred ?? false) ? index > 0 : note.slurred;
    const played = change?.note ?? note.note;
    const hz = frequency(played, a4) * 2 ** ((change?.cents ?? 0) / 1200);
    if (change?.extraAfter) {
      const middle = start + (end - start) / 2;
      events.push({ start, end: middle, hz, slurred });
      events.push({ start: middle, end, hz: frequency(change.extraAfter, a4), slurred: false });
    } else {
      events.push({ start, end, hz, slurred });
    }
  });

  let phase = 0;
  const vibratoPhase = random() * 2 * Math.PI;
  events.forEach((event, e) => {
    const next = events[e + 1];
    const joinsNext = next !== undefined && next.slurred && Math.abs(next.start - event.end) < 1e-6;
    const first = Math.round(event.start * sampleRate);
    const last = Math.round((joinsNext ? event.end : event.end - tongueGap) * sampleRate);
    if (!event.slurred) phase = 0;
    const attack = 0.03 * sampleRate;
    const release = 0.03 * sampleRate;
    for (let n = first; n < last && n < length; n += 1) {
      const t = n / sampleRate;
      const cents = vibrato.cents * Math.sin(2 * Math.PI * vibrato.hz * t + vibratoPhase);
      phase += (2 * Math.PI * event.hz * 2 ** (cents / 1200)) / sampleRate;
      let envelope = 1;
      if (!event.slurred && n - first < attack) envelope = (n - first) / attack;
      if (!joinsNext && last - n < release) envelope = Math.min(envelope, (last - n) / release);
      let value = 0;
      for (let h = 0; h < harmonics.length; h += 1) {
        if (event.hz * (h + 1) > sampleRate / 2) break;
        value += harmonics[h]! * Math.sin((h + 1) * phase);
      }
      tone[n] = 0.25 * envelope * (value + breath * 4 * (random() * 2 - 1));
    }
  });

  // Count-in: a 1 kHz click 20 ms long, decaying, on every beat.
  for (let click = 0; click < countIn; click += 1) {
    const first = Math.round((leadIn + click * beatSeconds) * sampleRate);
    for (let n = 0; n < 0.02 * sampleRate; n += 1) {
      tone[first + n]! +=
        0.3 * Math.exp(-n / (0.004 * sampleRate)) * Math.sin((2 * Math.PI * 1000 * n) / sampleRate);
    }
  }

  const roomed = (options.room ?? true) ? schroederRoom(tone, sampleRate) : tone;
  // A quiet room floor: noise 50 dB under the tone.
  for (let n = 0; n < roomed.length; n += 1) roomed[n]! += 0.001 * (random() * 2 - 1);
  return { samples: roomed, sampleRate, firstOnset };
}

/**
 * A small room: M. R. Schroeder's reverberator ("Natural sounding artificial reverberation",
 * J. Audio Eng. Soc. 10, 1962) — four parallel feedback combs and two all-passes — mixed in at
 * a third of the dry level, a reverberation time near 0.6 s.
 */
function schroederRoom(dry: Float32Array, sampleRate: number): Float32Array {
  const wet = new Float32Array(dry.length);
  const combs = [0.0297, 0.0371, 0.0411, 0.0437].map((s) => Math.round(s * sampleRate));
  for (const delay of combs) {
    const gain = 10 ** ((-3 * delay) / sampleRate / 0.6);
    const buffer = new Float32Array(dry.length);
    for (let n = 0; n < dry.length; n += 1) {
      buffer[n] = dry[n]! + (n >= delay ? gain * buffer[n - delay]! : 0);
      wet[n]! += buffer[n]! / combs.length;
    }
  }
  let signal = wet;
  for (const delay of [0.005, 0.0017].map((s) => Math.round(s * sampleRate))) {
    const gain = 0.7;
    const out = new Float32Array(signal.length);
    for (let n = 0; n < signal.length; n += 1) {
      const delayedIn = n >= delay ? signal[n - delay]! : 0;
      const delayedOut = n >= delay ? out[n - delay]! : 0;
      out[n] = -gain * signal[n]! + delayedIn + gain * delayedOut;
    }
    signal = out;
  }
  const mixed = new Float32Array(dry.length);
  for (let n = 0; n < dry.length; n += 1) mixed[n] = dry[n]! + 0.33 * signal[n]!;
  return mixed;
}

/** A small seeded generator (mulberry32), so every synthesised take is the same on every run. */
function mulberry32(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4_294_967_296;
  };
}

/** Writes mono 16-bit PCM WAVE bytes (the RIFF format of the Multimedia Programming Interface). */
export function wavBytes(samples: Float32Array, sampleRate: number): Uint8Array {
  const bytes = new Uint8Array(44 + samples.length * 2);
  const view = new DataView(bytes.buffer);
  const text = (offset: number, value: string) =>
    [...value].forEach((c, i) => view.setUint8(offset + i, c.charCodeAt(0)));
  text(0, 'RIFF');
  view.setUint32(4, 36 + samples.length * 2, true);
  text(8, 'WAVE');
  text(12, 'fmt ');
  view.setUint32(16, 16, true);
  view.setUint16(20, 1, true);
  view.setUint16(22, 1, true);
  view.setUint32(24, sampleRate, true);
  view.setUint32(28, sampleRate * 2, true);
  view.setUint16(32, 2, true);
  view.setUint16(34, 16, true);
  text(36, 'data');
  view.setUint32(40, samples.length * 2, true);
  samples.forEach((sample, i) => {
    view.setInt16(44 + i * 2, Math.round(Math.max(-1, Math.min(1, sample)) * 32_767), true);
  });
  return bytes;
}

export { midi };
