import { PitchDetector } from 'pitchy';

/** The pitch and loudness of a take, frame by frame, at a fixed hop. */
export interface PitchTrack {
  /** Seconds between frames. */
  hopSeconds: number;
  /** Seconds from the take's start to the centre of frame 0. */
  firstFrameSeconds: number;
  /** Fractional MIDI note of each frame (tuned to the take's A4), NaN where no pitch is heard. */
  midi: Float64Array;
  /** Clarity of each frame's pitch, 0..1 (the height of the chosen NSDF peak). */
  clarity: Float32Array;
  /** Short-time level of each frame in decibels relative to full scale. */
  levelDb: Float32Array;
}

/** The rate the pitch track works at: a 44.1 kHz take is low-passed and kept one sample in four. */
const workingRate = 11_025;
/** Lowest and highest fundamentals heard: the concert range of band and orchestra winds. */
const lowestHz = 27.5;
const highestHz = 4_500;
/**
 * The clarity a frame needs to count as pitched. McLeod and Wyvill's clarity is the normalised
 * peak height; breath noise lowers it, a clean tone sits near 1.
 */
const pitchedClarity = 0.8;

/** The integer factor a take is decimated by before pitch detection. */
export function decimationFactor(sampleRate: number): number {
  return Math.max(1, Math.floor(sampleRate / workingRate + 1e-9));
}

/** Windowed-sinc low-pass taps (Blackman window) with the cut-off at 90 % of the new Nyquist. */
function lowPassTaps(factor: number): Float64Array {
  const half = 8 * factor;
  const taps = new Float64Array(2 * half + 1);
  const cutoff = 0.45 / factor;
  let sum = 0;
  for (let i = -half; i <= half; i += 1) {
    const x = 2 * Math.PI * cutoff * i;
    const sinc = i === 0 ? 1 : Math.sin(x) / x;
    const w = (2 * Math.PI * (i + half)) / (2 * half);
    const blackman = 0.42 - 0.5 * Math.cos(w) + 0.08 * Math.cos(2 * w);
    taps[i + half] = sinc * blackman;
    sum += taps[i + half]!;
  }
  for (let i = 0; i < taps.length; i += 1) taps[i]! /= sum;
  return taps;
}

/** Fills `output` with decimated samples `first`, `first + 1`… (at the new rate). */
function decimateInto(
  samples: Float32Array,
  factor: number,
  taps: Float64Array,
  first: number,
  output: Float32Array,
): void {
  if (factor === 1) {
    for (let n = 0; n < output.length; n += 1) output[n] = samples[first + n] ?? 0;
    return;
  }
  const count = taps.length;
  const half = (count - 1) / 2;
  for (let n = 0; n < output.length; n += 1) {
    const from = (first + n) * factor - half;
    let acc = 0;
    if (from >= 0 && from + count <= samples.length) {
      for (let k = 0; k < count; k += 1) acc += (taps[k] as number) * (samples[from + k] as number);
    } else {
      for (let k = 0; k < count; k += 1) {
        const value = samples[from + k];
        if (value !== undefined) acc += (taps[k] as number) * value;
      }
    }
    output[n] = acc;
  }
}

/**
 * Low-passes and decimates a take by an integer factor with a windowed-sinc FIR, so that upper
 * harmonics do not fold back onto the fundamental; then removes DC and rumble with a one-pole
 * high-pass at 20 Hz.
 */
export function decimate(samples: Float32Array, factor: number, sampleRate: number): Float32Array {
  const output = new Float32Array(Math.floor(samples.length / factor));
  decimateInto(samples, factor, lowPassTaps(factor), 0, output);
  const rate = sampleRate / factor;
  const alpha = 1 / (1 + (2 * Math.PI * 20) / rate);
  let previousIn = 0;
  let previousOut = 0;
  for (let n = 0; n < output.length; n += 1) {
    const x = output[n]!;
    const y = alpha * (previousOut + x - previousIn);
    previousIn = x;
    previousOut = y;
    output[n] = y;
  }
  return output;
}

/** The analysis window at a working rate: the power of two spanning at least 80 ms. */
export function windowLength(rate: number): number {
  let length = 256;
  while (length < 0.08 * rate) length *= 2;
  return length;
}

/**
 * Tracks pitch frame by frame with the McLeod pitch method (P. McLeod and G. Wyvill, "A
 * Smarter Way to Find Pitch", Proc. International Computer Music Conference 2005), as the
 * `pitchy` package implements it: the normalised square difference function, its key maxima,
 * and the first key maximum within k of the highest (k = 0.9, the paper's value). Choosing the
 * first high peak rather than the highest is what keeps a tone whose second or third harmonic
 * is stronger than its fundamental (low reeds, brass) on its fundamental.
 *
 * Frames are 80–128 ms long (two periods of the lowest tuba notes) with a hop of an eighth of
 * that. Frames quieter than 35 dB under the take's loud frames are not analysed.
 */
export function pitchTrack(samples: Float32Array, sampleRate: number, a4: number): PitchTrack {
  const factor = decimationFactor(sampleRate);
  const signal = decimate(samples, factor, sampleRate);
  const rate = sampleRate / factor;
  const window = windowLength(rate);
  const hop = window / 8;
  const frames = signal.length >= window ? Math.floor((signal.length - window) / hop) + 1 : 0;

  const levelDb = new Float32Array(frames);
  const frameRms = new Float32Array(frames);
  for (let k = 0; k < frames; k += 1) {
    const centre = k * hop + window / 2;
    let energy = 0;
    for (let s = centre - hop; s < centre + hop; s += 1) energy += signal[s]! * signal[s]!;
    const rms = Math.sqrt(energy / (2 * hop));
    frameRms[k] = rms;
    levelDb[k] = 20 * Math.log10(rms + 1e-9);
  }
  const loud = percentile(frameRms, 0.99);
  const quietest = Math.max(loud * 10 ** (-35 / 20), 1e-4);

  const detector = PitchDetector.forFloat32Array(window);
  detector.clarityThreshold = 0.9;
  const fine = fineDetectors(samples, sampleRate, factor);
  const midi = new Float64Array(frames).fill(Number.NaN);
  const clarity = new Float32Array(frames);
  // Pitch on every other frame (23 ms apart; the 93 ms windows overlap by three quarters
  // still); the frames between take their neighbours' pitch. Level keeps every frame (11.6 ms)
  // for the attacks.
  for (let k = 0; k < frames; k += 2) {
    if (frameRms[k]! < quietest) continue;
    let [hz, frameClarity] = detector.findPitch(signal.subarray(k * hop, k * hop + window), rate);
    for (const finer of fine) {
      if (hz < finer.aboveHz) break;
      // The centre of frame k, in the finer signal's samples.
      const centre = Math.round(((k * hop + window / 2) / rate) * finer.rate);
      const from = centre - finer.window / 2;
      if (from >= 0 && (from + finer.window) * finer.factor <= samples.length) {
        // Decimated here, for this frame only: few frames of a take are high.
        decimateInto(samples, finer.factor, finer.taps, from, finer.buffer);
        let mean = 0;
        for (const value of finer.buffer) mean += value;
        mean /= finer.window;
        for (let n = 0; n < finer.window; n += 1) finer.buffer[n]! -= mean;
        const [fineHz, fineClarity] = finer.detector.findPitch(finer.buffer, finer.rate);
        // A short window can lose the pitch for a frame; the coarse answer then stands (the
        // running median below removes it where it was an octave low).
        if (fineClarity >= pitchedClarity) [hz, frameClarity] = [fineHz, fineClarity];
      }
    }
    clarity[k] = frameClarity;
    if (frameClarity >= pitchedClarity && hz >= lowestHz && hz <= highestHz) {
      midi[k] = 69 + 12 * Math.log2(hz / a4);
    }
  }
  for (let k = 1; k < frames; k += 2) {
    const before = midi[k - 1]!;
    const after = midi[k + 1] ?? Number.NaN;
    if (frameRms[k]! < quietest) continue;
    clarity[k] = Math.min(clarity[k - 1]!, clarity[k + 1] ?? 0);
    midi[k] =
      !Number.isNaN(before) && !Number.isNaN(after) && Math.abs(before - after) < 0.5
        ? (before + after) / 2
        : !Number.isNaN(before)
          ? before
          : after;
  }
  return {
    hopSeconds: hop / rate,
    firstFrameSeconds: window / 2 / rate,
    midi: medianOfFive(bridgeShortGaps(midi)),
    clarity,
    levelDb,
  };
}

/**
 * Finer detectors for high notes. At 11 kHz the period of an A5 is only 12.5 samples; with strong
 * upper harmonics the NSDF, sampled at whole lags, misses the top of its peak at that lag by
 * more than it misses the peak at twice the lag, which then wins the k = 0.9 test: the method
 * answers an octave low. An octave-low answer for a note from about 760 Hz up (a period of 14.5
 * samples or less) lands above 380 Hz, so such frames are heard again at twice the rate
 * (22.05/24 kHz), and frames still above 760 Hz at four times the rate (the take's own 44.1/48
 * kHz), each time with a 23 ms window (nine periods of 380 Hz) to keep the cost down.
 */
interface FineDetector {
  aboveHz: number;
  factor: number;
  taps: Float64Array;
  buffer: Float32Array;
  rate: number;
  window: number;
  detector: PitchDetector<Float32Array>;
}

function fineDetectors(
  samples: Float32Array,
  sampleRate: number,
  coarseFactor: number,
): FineDetector[] {
  const detectors: FineDetector[] = [];
  for (const [times, aboveHz] of [
    [2, 380],
    [4, 760],
  ] as const) {
    const factor = Math.max(1, Math.floor(sampleRate / (times * workingRate) + 1e-9));
    const previous = detectors[detectors.length - 1];
    if (factor >= coarseFactor || (previous && sampleRate / factor <= previous.rate)) continue;
    const rate = sampleRate / factor;
    let window = 256;
    while (window < 0.02 * rate) window *= 2;
    const detector = PitchDetector.forFloat32Array(window);
    detector.clarityThreshold = 0.9;
    detectors.push({
      aboveHz,
      factor,
      taps: lowPassTaps(factor),
      buffer: new Float32Array(window),
      rate,
      window,
      detector,
    });
  }
  return detectors;
}

/**
 * Fills runs of one or two unpitched frames between two frames within a quarter tone of each
 * other (a frame where the pitch slipped, inside a held note). Tongued attacks still cut there
 * by their dip in level.
 */
function bridgeShortGaps(values: Float64Array): Float64Array {
  const output = Float64Array.from(values);
  for (let k = 1; k < values.length - 1; k += 1) {
    if (!Number.isNaN(values[k]!) || Number.isNaN(values[k - 1]!)) continue;
    let end = k;
    while (end < values.length && Number.isNaN(values[end]!) && end - k < 3) end += 1;
    const after = values[end];
    if (end - k <= 2 && after !== undefined && !Number.isNaN(after)) {
      if (Math.abs(after - values[k - 1]!) < 0.5) {
        for (let j = k; j < end; j += 1) output[j] = (values[k - 1]! + after) / 2;
      }
    }
  }
  return output;
}

/**
 * A running median over five frames (58 ms) of the pitched frames, which removes single-frame
 * octave slips and spikes; a frame keeps its value when fewer than three neighbours are pitched.
 */
function medianOfFive(values: Float64Array): Float64Array {
  const output = new Float64Array(values.length);
  const window: number[] = [];
  for (let k = 0; k < values.length; k += 1) {
    if (Number.isNaN(values[k]!)) {
      output[k] = Number.NaN;
      continue;
    }
    window.length = 0;
    for (let j = k - 2; j <= k + 2; j += 1) {
      const v = values[j];
      if (v !== undefined && !Number.isNaN(v)) window.push(v);
    }
    if (window.length < 3) {
      output[k] = values[k]!;
      continue;
    }
    window.sort((a, b) => a - b);
    output[k] = window[Math.floor(window.length / 2)]!;
  }
  return output;
}

function percentile(values: Float32Array, share: number): number {
  if (values.length === 0) return 0;
  const sorted = Float32Array.from(values).sort();
  return sorted[Math.min(sorted.length - 1, Math.floor(share * sorted.length))]!;
}
