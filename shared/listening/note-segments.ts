import type { PitchTrack } from './pitch-track';

/** A note heard in a take: where it starts and ends and its pitch. */
export interface HeardNote {
  /** Seconds from the take's start. */
  onset: number;
  /** Seconds. */
  duration: number;
  /** Fractional MIDI note (tuned to the take's A4): the trimmed mean of its steady frames. */
  midi: number;
}

/** How far (in semitones) a frame may stray from its note before a pitch change is heard. */
const pitchChange = 0.6;
/** Frames (at 11.6 ms) a pitch change must last: vibrato and slips shorter than this stay inside. */
const pitchChangeFrames = 3;
/** Decibels a level must dip and rise again to mark a tongued onset between notes. */
const dipDepthDb = 4.5;

/**
 * Cuts a pitch track into notes. A note ends where the pitch stops (silence, noise), where the
 * level dips and rises again (a tongued attack, even on a repeated note, even with a room's
 * reverberation partly filling the gap), or where the pitch moves more than 60 cents from the
 * note's own pitch for three frames (a slurred change, which has no gap at all). Pieces shorter
 * than `shortestSeconds` are dropped: clicks, consonants, the transient between two notes.
 */
export function noteSegments(track: PitchTrack, shortestSeconds: number): HeardNote[] {
  const { midi, hopSeconds } = track;
  const onsets = tonguedOnsets(track.levelDb);
  const pieces: { start: number; end: number }[] = [];
  let start = -1;
  let reference: number[] = [];
  let strayFrom = -1;
  const close = (end: number) => {
    if (start >= 0 && end > start) pieces.push({ start, end });
    start = -1;
    reference = [];
    strayFrom = -1;
  };
  for (let k = 0; k < midi.length; k += 1) {
    const value = midi[k]!;
    if (Number.isNaN(value)) {
      close(k);
      continue;
    }
    if (start < 0) {
      start = k;
      reference = [value];
      continue;
    }
    if (onsets.has(k)) {
      close(k);
      start = k;
      reference = [value];
      continue;
    }
    const centre = median(reference);
    if (Math.abs(value - centre) > pitchChange) {
      if (strayFrom < 0) strayFrom = k;
      if (k - strayFrom + 1 >= pitchChangeFrames) {
        const from = strayFrom;
        close(from);
        start = from;
        reference = Array.from(midi.subarray(from, k + 1));
      }
      continue;
    }
    strayFrom = -1;
    if (reference.length < 24) reference.push(value);
  }
  close(midi.length);

  const shortestFrames = Math.max(3, Math.round(shortestSeconds / hopSeconds));
  const notes: HeardNote[] = [];
  let previousEndFrame = -1;
  let previousLoudest = -Infinity;
  const onsetBetween = (from: number, to: number) => {
    for (let k = Math.max(0, from - 1); k <= to + 1; k += 1) if (onsets.has(k)) return true;
    return false;
  };
  for (const piece of pieces) {
    const frames = piece.end - piece.start;
    if (frames < shortestFrames) continue;
    const pitch = steadyPitch(midi.subarray(piece.start, piece.end));
    const previous = notes[notes.length - 1];
    const onset = track.firstFrameSeconds + piece.start * hopSeconds;
    const previousEnd = previous ? previous.onset + previous.duration : -Infinity;
    // A piece split off by a brief unpitched glitch, at the same pitch and with no tongued
    // onset between, is the same note continuing.
    const loudest = (from: number, to: number) => Math.max(...track.levelDb.subarray(from, to));
    if (
      previous &&
      Math.abs(previous.midi - pitch) < 0.5 &&
      onset - previousEnd <= 4 * hopSeconds &&
      (!onsetBetween(previousEndFrame, piece.start) ||
        // Far quieter than the note before: that note's tail in the room.
        loudest(piece.start, piece.end) < previousLoudest - 12)
    ) {
      previousEndFrame = piece.end;
      const total = previous.duration + frames * hopSeconds;
      previous.midi = (previous.midi * previous.duration + pitch * frames * hopSeconds) / total;
      previous.duration = onset + frames * hopSeconds - previous.onset;
      continue;
    }
    previousEndFrame = piece.end;
    previousLoudest = Math.max(...track.levelDb.subarray(piece.start, piece.end));
    notes.push({ onset, duration: frames * hopSeconds, midi: pitch });
  }
  return notes;
}

/**
 * Frames where a tongued note starts: the bottom of a dip in level at least `dipDepthDb` deep
 * on both sides within ±93 ms, the lowest frame within ±58 ms.
 */
function tonguedOnsets(levelDb: Float32Array): Set<number> {
  const onsets = new Set<number>();
  for (let k = 1; k < levelDb.length - 1; k += 1) {
    const level = levelDb[k]!;
    let isLowest = true;
    for (let j = Math.max(0, k - 5); j <= Math.min(levelDb.length - 1, k + 5); j += 1) {
      if (levelDb[j]! < level || (levelDb[j] === level && j < k)) {
        isLowest = false;
        break;
      }
    }
    if (!isLowest) continue;
    let before = -Infinity;
    let after = -Infinity;
    for (let j = Math.max(0, k - 8); j < k; j += 1) before = Math.max(before, levelDb[j]!);
    for (let j = k + 1; j <= Math.min(levelDb.length - 1, k + 8); j += 1) {
      after = Math.max(after, levelDb[j]!);
    }
    // The level after the dip must come back near the level before it: a new note, not an echo
    // in the room's decay after the last one.
    if (before - level >= dipDepthDb && after - level >= dipDepthDb && after >= before - 8) {
      onsets.add(k);
    }
  }
  return onsets;
}

/**
 * The pitch of a note: the mean of its middle frames with the highest and lowest quarter left
 * out. The first and last frames are left out too, since their window reaches into the
 * neighbouring note; vibrato averages out over its cycles.
 */
function steadyPitch(frames: Float64Array): number {
  const edge = Math.min(4, Math.floor(frames.length / 4));
  const middle = Array.from(frames.subarray(edge, frames.length - edge)).sort((a, b) => a - b);
  const trim = Math.floor(middle.length / 4);
  const kept = middle.slice(trim, middle.length - trim);
  return kept.reduce((sum, value) => sum + value, 0) / kept.length;
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)]!;
}
