import * as z from 'zod';
import { parseGradeLevel } from './grade-level';
import { resolveInstrument, type InstrumentId } from './instrument-names';
import { rosterFieldLabels, type RosterField } from './roster-columns';

/** The longest name (first, last, preferred, guardian) a roster row keeps. */
export const longestName = 80;

/** The longest ensemble name a roster row keeps. */
export const longestEnsembleName = 80;

/** The longest district student id a roster row keeps. */
export const longestStudentId = 64;

/** One roster row after validation: one student in one ensemble (or in none). */
export interface RosterRow {
  /**
   * The district's student id as its systems write it: printable, no spaces or control
   * characters (`mary.jones`, `S-00417`, `ab+1@sis`), compared case-sensitively.
   */
  studentId: string;
  firstName: string;
  lastName: string;
  preferredName?: string;
  /** 0 for kindergarten, else 1 to 12. */
  grade: number;
  /** The school's code in upper case, e.g. 'HPMS'. */
  schoolCode: string;
  ensemble?: string;
  instrument?: InstrumentId;
  guardianName?: string;
  guardianEmail?: string;
}

// Any printable character but white space: \p{C} is Unicode's "Other" category (controls,
// format characters such as U+200B, surrogates, private use, unassigned), \p{Z} its separators.
const studentIdCharacters = /^[^\s\p{C}\p{Z}]+$/u;
const schoolCodeCharacters = /^[A-Z0-9]{2,10}$/;
const whitespaceRun = /\s+/g;
const unusualWhitespace = /\s\s|[^\S ]/;

// The same e-mail pattern as zod's z.email(), used directly so that a row is checked in one pass.
const emailAddress = z.regexes.email;

/** A value as it appears in a message: quoted, and cut short when long. */
export function quoteValue(value: string): string {
  return `'${value.length > 40 ? `${value.slice(0, 39)}…` : value}'`;
}

const textCell = (field: RosterField) =>
  z.string({ error: `${rosterFieldLabels[field]} must be text.` }).nullish();

// A row arrives as text cells (CSV), or with the grade as a number (a form); a missing cell is
// an empty one.
const rosterCellsSchema = z.object({
  studentId: textCell('studentId'),
  firstName: textCell('firstName'),
  lastName: textCell('lastName'),
  preferredName: textCell('preferredName'),
  grade: z.union([z.string(), z.number()], { error: 'Grade must be K or 1 to 12.' }).nullish(),
  schoolCode: textCell('schoolCode'),
  ensemble: textCell('ensemble'),
  instrument: textCell('instrument'),
  guardianName: textCell('guardianName'),
  guardianEmail: textCell('guardianEmail'),
});

type RosterCells = z.output<typeof rosterCellsSchema>;

/** Trimmed, with every run of white space (line breaks included) made one space. */
function clean(cell: string | null | undefined): string {
  if (cell == null) return '';
  const trimmed = cell.trim();
  return unusualWhitespace.test(trimmed) ? trimmed.replace(whitespaceRun, ' ') : trimmed;
}

// Line breaks and tabs are white space and already made spaces; other C0 and C1 controls
// (U+0000–U+001F, U+007F–U+009F) are noise in a name.
function hasControlCharacter(text: string): boolean {
  for (let index = 0; index < text.length; index++) {
    const code = text.charCodeAt(index);
    if (code < 0x20 || (code >= 0x7f && code <= 0x9f)) return true;
  }
  return false;
}

type Problem = [RosterField, string];
const pendingProblems: Problem[] = [];

function nameCell(
  cells: RosterCells,
  field: 'firstName' | 'lastName' | 'preferredName' | 'ensemble' | 'guardianName',
  required: boolean,
  problems: Problem[],
): string | undefined {
  const text = clean(cells[field]);
  const label = rosterFieldLabels[field];
  if (text === '' && required) problems.push([field, `${label} is required.`]);
  const longest = field === 'ensemble' ? longestEnsembleName : longestName;
  if (text.length > longest) {
    problems.push([field, `${label} is longer than ${longest} characters.`]);
  }
  if (hasControlCharacter(text)) problems.push([field, `${label} holds a control character.`]);
  return text === '' ? undefined : text;
}

function normaliseRow(cells: RosterCells, context: z.RefinementCtx): RosterRow {
  // Rows are checked one at a time, so one list serves them all; it is emptied for each row.
  const problems = pendingProblems;
  problems.length = 0;
  const studentId = clean(cells.studentId);
  if (studentId === '') problems.push(['studentId', 'Student ID is required.']);
  else if (studentId.length > longestStudentId) {
    problems.push([
      'studentId',
      `Student ID ${quoteValue(studentId)} is longer than ${longestStudentId} characters.`,
    ]);
  } else if (!studentIdCharacters.test(studentId)) {
    problems.push([
      'studentId',
      `Student ID ${quoteValue(studentId)} may not contain spaces or control characters.`,
    ]);
  }
  const firstName = nameCell(cells, 'firstName', true, problems);
  const lastName = nameCell(cells, 'lastName', true, problems);
  const preferredName = nameCell(cells, 'preferredName', false, problems);

  const gradeText = typeof cells.grade === 'number' ? String(cells.grade) : clean(cells.grade);
  const grade = gradeText === '' ? null : parseGradeLevel(cells.grade ?? '');
  if (gradeText === '') problems.push(['grade', 'Grade is required.']);
  else if (grade === null) {
    problems.push(['grade', `Grade must be K or 1 to 12; got ${quoteValue(gradeText)}.`]);
  }

  // School codes are compared in upper case: "hpms" in a hand-made file is HPMS.
  const schoolText = clean(cells.schoolCode);
  const schoolCode = schoolText.toUpperCase();
  if (schoolText === '') problems.push(['schoolCode', 'School code is required.']);
  else if (!schoolCodeCharacters.test(schoolCode)) {
    problems.push([
      'schoolCode',
      `School code ${quoteValue(schoolText)} must be 2 to 10 letters or digits, e.g. 'HPMS'.`,
    ]);
  }

  const ensemble = nameCell(cells, 'ensemble', false, problems);
  const instrumentText = clean(cells.instrument);
  const instrument = instrumentText === '' ? undefined : resolveInstrument(instrumentText);
  if (instrument === null) {
    problems.push([
      'instrument',
      `Instrument ${quoteValue(instrumentText)} is not one we know; use an instrument id or its usual name, e.g. 'Alto Saxophone'.`,
    ]);
  }
  const guardianName = nameCell(cells, 'guardianName', false, problems);
  const guardianEmail = clean(cells.guardianEmail);
  if (guardianEmail !== '' && !emailAddress.test(guardianEmail)) {
    problems.push([
      'guardianEmail',
      `Guardian e-mail ${quoteValue(guardianEmail)} is not a valid e-mail address.`,
    ]);
  }

  if (problems.length > 0) {
    for (const [field, message] of problems) {
      context.issues.push({ code: 'custom', message, input: cells[field], path: [field] });
    }
    return z.NEVER;
  }
  const row: RosterRow = {
    studentId,
    firstName: firstName as string,
    lastName: lastName as string,
    grade: grade as number,
    schoolCode,
  };
  // Optional fields are left out when empty, not set to undefined, so rows compare and serialise
  // the same whichever way they were made.
  if (preferredName) row.preferredName = preferredName;
  if (ensemble) row.ensemble = ensemble;
  if (instrument) row.instrument = instrument;
  if (guardianName) row.guardianName = guardianName;
  if (guardianEmail) row.guardianEmail = guardianEmail;
  return row;
}

/**
 * One normalised roster row: a student in one ensemble (or in none). Takes cells as text (the
 * grade may be a number), trims them, and gives every problem in words a coordinator
 * understands, each on its field's path. The grade comes out as 0 (kindergarten) to 12, the
 * school code in upper case, the instrument as an instrument id, and empty optional cells absent.
 */
export const rosterRowSchema = rosterCellsSchema.transform(normaliseRow);

/** What {@link rosterRowSchema} accepts: each cell as text (the grade also as a number). */
export type RosterRowInput = z.input<typeof rosterRowSchema>;
