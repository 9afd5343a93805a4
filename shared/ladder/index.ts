/**
 * The scale-ladder rules: which requirements a student has met and which rung they stand on.
 * Runs in the browser and in Node alike; the server's attainment summary is computed with these
 * same functions, so the Overview and a student's own page always agree.
 */
export {
  appliesTo,
  currentRung,
  isMet,
  metRequirements,
  nextRequirements,
  type PassOffRecord,
  type Requirement,
  type Rung,
} from './rules';
export { benchmarksInForce, type Benchmark } from './benchmarks';
