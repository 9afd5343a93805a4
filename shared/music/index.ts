/**
 * The music engine: scales, key signatures, transposing instruments, practice patterns,
 * MusicXML practice sheets and practice plans. Runs in the browser and in Node alike.
 */
export {
  frequency,
  midi,
  parseNote,
  formatNote,
  pitchClass,
  type Letter,
  type SpelledPitch,
} from './pitch';
export {
  intervalSize,
  transposeNote,
  transposeBySize,
  type Interval,
  type IntervalSize,
} from './interval';
export {
  checkKey,
  isMinor,
  isStandardKey,
  keyName,
  keySignature,
  majorTonics,
  minorTonics,
  modes,
  type Key,
  type Mode,
} from './keys';
export { arpeggio, scale, type Direction } from './scales';
export {
  instrumentFamilies,
  instruments,
  type InstrumentFamily,
  type InstrumentSpec,
  type NoteRange,
} from './instrument-data';
export { findInstrument, instrumentById, transpositionSize } from './instruments';
export { simplestSpelling, toConcert, toWritten, writtenKey } from './transposition';
export { patternIds, type PatternId } from './pattern-shapes';
export {
  articulations,
  durationSeconds,
  pattern,
  PatternRangeError,
  type Articulation,
  type PatternNote,
  type PatternOptions,
  type PatternPitch,
} from './patterns';
export { clefWords, sheetClefs, type StaffClef } from './clefs';
export { toMusicXml, type MusicXmlOptions } from './musicxml';
export { practicePlan, type PracticeRequirement, type PracticeStep } from './practice-plan';
export {
  levelOfGrade,
  levelReach,
  patternForLevel,
  schoolLevelNames,
  schoolLevels,
  schoolRange,
  schoolRanges,
  type LevelReach,
  type ReachRequest,
  type SchoolLevel,
} from './school-ranges';
