import { Injectable, signal } from '@angular/core';

/** A finished recording: the file to keep and its samples to analyse. */
export interface RecordedTake {
  blob: Blob;
  samples: Float32Array;
  sampleRate: number;
}

/**
 * Records from the microphone: MediaRecorder for the file, an AnalyserNode for the level meter,
 * and the browser's own decoder for the samples the analysis hears. Echo cancellation, noise
 * suppression and automatic gain are turned off: they would bend the very pitch being judged.
 */
@Injectable({ providedIn: 'root' })
export class TakeRecorder {
  /** The input level, 0..1 (peak of the last frame), while recording. */
  readonly level = signal(0);

  private stream?: MediaStream;
  private recorder?: MediaRecorder;
  private context?: AudioContext;
  private meterFrame?: number;

  /** Asks for the microphone (the browser shows its permission prompt) and starts recording. */
  async start(): Promise<void> {
    this.stream = await navigator.mediaDevices.getUserMedia({
      audio: { echoCancellation: false, noiseSuppression: false, autoGainControl: false },
    });
    this.context = new AudioContext();
    const analyser = this.context.createAnalyser();
    analyser.fftSize = 2048;
    this.context.createMediaStreamSource(this.stream).connect(analyser);
    const frame = new Float32Array(analyser.fftSize);
    const meter = () => {
      analyser.getFloatTimeDomainData(frame);
      let peak = 0;
      for (const value of frame) peak = Math.max(peak, Math.abs(value));
      this.level.set(Math.min(1, peak));
      this.meterFrame = requestAnimationFrame(meter);
    };
    meter();
    this.recorder = new MediaRecorder(this.stream);
    this.recorder.start();
  }

  /** Stops recording and answers the take. */
  async stop(): Promise<RecordedTake> {
    const recorder = this.recorder;
    if (!recorder) throw new Error('Not recording.');
    const chunks: Blob[] = [];
    recorder.ondataavailable = (event) => chunks.push(event.data);
    const stopped = new Promise<void>((resolve) => (recorder.onstop = () => resolve()));
    recorder.stop();
    await stopped;
    const blob = new Blob(chunks, { type: recorder.mimeType || 'audio/webm' });
    const context = this.context!;
    this.release();
    const decoded = await context.decodeAudioData(await blob.arrayBuffer());
    await context.close();
    return { blob, samples: decoded.getChannelData(0).slice(), sampleRate: decoded.sampleRate };
  }

  /** Lets the microphone go without keeping anything. */
  cancel(): void {
    if (this.recorder?.state === 'recording') this.recorder.stop();
    void this.context?.close();
    this.release();
  }

  private release(): void {
    if (this.meterFrame !== undefined) cancelAnimationFrame(this.meterFrame);
    this.meterFrame = undefined;
    this.stream?.getTracks().forEach((track) => track.stop());
    this.stream = undefined;
    this.recorder = undefined;
    this.level.set(0);
  }
}
