import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { frequency, pattern, type PatternNote } from '../music';
import { analyseTake } from './index';

const folder = fs.mkdtempSync(path.join(os.tmpdir(), 'tutti-sox-take-'));
afterAll(() => fs.rmSync(folder, { recursive: true, force: true }));

/**
 * A take rendered by SoX (Debian package `sox`, its `synth` generator and effects): each note a
 * band-limited sawtooth (every harmonic, as a reed or brass tone has) low-passed at 2.5 kHz, with
 * 5.5 Hz tremolo, a 40 ms attack and 60 ms release; pink breath noise under the whole take; the
 * `reverb` effect for a room; 1.5 s of silence in front. Nothing of it is computed by our code.
 */
function soxTake(notes: PatternNote[], bpm: number, playedHz: (index: number) => number): string {
  const parts: string[] = [];
  notes.forEach((note, index) => {
    const seconds = (note.beats * 60) / bpm;
    const file = path.join(folder, `note-${index}.wav`);
    execFileSync('sox', [
      ...['-n', '-r', '44100', '-b', '16', '-c', '1', file],
      ...['synth', String(seconds - 0.05), 'sawtooth', playedHz(index).toFixed(3)],
      ...['lowpass', '-1', '2500', 'tremolo', '5.5', '20'],
      ...['fade', 'q', '0.04', String(seconds - 0.05), '0.06', 'gain', '-10', 'pad', '0', '0.05'],
    ]);
    parts.push(file);
  });
  const tones = path.join(folder, 'tones.wav');
  execFileSync('sox', [...parts, tones]);
  const seconds = Number(execFileSync('soxi', ['-D', tones]).toString());
  const breath = path.join(folder, 'breath.wav');
  execFileSync('sox', [
    ...['-n', '-r', '44100', '-b', '16', '-c', '1', breath],
    ...['synth', String(seconds), 'pinknoise', 'vol', '0.02'],
  ]);
  const take = path.join(folder, 'take.wav');
  execFileSync('sox', ['-m', tones, breath, take, 'reverb', '40', 'pad', '1.5', '0']);
  return take;
}

/** The samples of a 16-bit PCM WAVE file, as SoX writes it (the RIFF 'fmt ' and 'data' chunks). */
function readWav(file: string): { samples: Float32Array; sampleRate: number } {
  const bytes = fs.readFileSync(file);
  let offset = 12;
  let sampleRate = 0;
  let channels = 1;
  while (offset + 8 <= bytes.length) {
    const id = bytes.toString('ascii', offset, offset + 4);
    const size = bytes.readUInt32LE(offset + 4);
    if (id === 'fmt ') {
      channels = bytes.readUInt16LE(offset + 10);
      sampleRate = bytes.readUInt32LE(offset + 12);
    }
    if (id === 'data') {
      const frames = size / 2 / channels;
      const samples = new Float32Array(frames);
      for (let i = 0; i < frames; i += 1) {
        samples[i] = bytes.readInt16LE(offset + 8 + i * 2 * channels) / 32_768;
      }
      return { samples, sampleRate };
    }
    offset += 8 + size + (size % 2);
  }
  throw new Error(`${file} has no data chunk.`);
}

describe('analyseTake on a take rendered by SoX', { timeout: 60_000 }, () => {
  it('should hear a wind-like take with one note played 40 cents flat', () => {
    const notes = pattern(
      'cycle-broad',
      { tonic: 'F', mode: 'major' },
      { instrument: 'alto-saxophone' },
    );
    const take = readWav(
      soxTake(
        notes,
        96,
        (index) => frequency(notes[index]!.note) * 2 ** ((index === 4 ? -40 : 0) / 1200),
      ),
    );
    const analysis = analyseTake(take.samples, take.sampleRate, notes, 96);
    expect(analysis.notes.map((note) => note.verdict)).toEqual(
      notes.map((_, index) => (index === 4 ? 'out-of-tune' : 'ok')),
    );
    expect(analysis.notes[4]!.centsOff).toBeLessThan(-30);
    expect(analysis.extraNotes).toBe(0);
    expect(analysis.tempo).toBeGreaterThan(94);
    expect(analysis.tempo).toBeLessThan(98);
    // The silence SoX padded in front.
    expect(analysis.notes[0]!.onset).toBeGreaterThan(1.45);
    expect(analysis.notes[0]!.onset).toBeLessThan(1.6);
  });
});
