import type { TakeAnalysis } from '@shared/listening';
import type { PatternNote } from '@shared/music';

/** What the page sends the analysis worker. */
export interface TakeJob {
  samples: Float32Array;
  sampleRate: number;
  notes: PatternNote[];
  tempo: number;
}

/** What the worker answers: the analysis, or why there is none. */
export type TakeJobAnswer = { analysis: TakeAnalysis } | { problem: string };

/** Runs one analysis in a Web Worker and ends the worker. */
export function analyseInWorker(job: TakeJob): Promise<TakeJobAnswer> {
  return new Promise((resolve) => {
    const worker = new Worker(new URL('./take-analysis.worker', import.meta.url), {
      type: 'module',
    });
    worker.onmessage = (event: MessageEvent<TakeJobAnswer>) => {
      worker.terminate();
      resolve(event.data);
    };
    worker.onerror = () => {
      worker.terminate();
      resolve({ problem: 'The take could not be analysed in this browser.' });
    };
    worker.postMessage(job, [job.samples.buffer]);
  });
}
