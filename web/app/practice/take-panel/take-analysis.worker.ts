import { analyseTake, TakeError } from '@shared/listening';
import type { TakeJob, TakeJobAnswer } from './take-job';

/** Analyses a take off the page's thread, so the page stays responsive while it listens. */
addEventListener('message', (event: MessageEvent<TakeJob>) => {
  const { samples, sampleRate, notes, tempo } = event.data;
  let answer: TakeJobAnswer;
  try {
    answer = { analysis: analyseTake(samples, sampleRate, notes, tempo) };
  } catch (error) {
    answer = {
      problem:
        error instanceof TakeError
          ? error.message
          : 'The take could not be analysed in this browser.',
    };
  }
  (self as unknown as { postMessage(message: TakeJobAnswer): void }).postMessage(answer);
});
