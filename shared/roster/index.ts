export * from './grade-level';
export * from './instrument-names';
export * from './roster-columns';
export * from './roster-csv';
export * from './roster-row';
export * from './seat-moves';
