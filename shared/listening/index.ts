/**
 * The listening aid: hears a take of a practice pattern (pitch of every note, where each
 * starts, the tempo kept) and compares it with the pattern. Pure TypeScript; runs in a Web
 * Worker in the browser and in Node alike. It suggests; a director decides.
 */
export {
  analyseTake,
  longestTakeSeconds,
  takeSampleRates,
  TakeError,
  type NoteAnalysis,
  type NoteVerdict,
  type TakeAnalysis,
  type TakeProblem,
} from './take-analysis';
