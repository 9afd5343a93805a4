import { z } from 'zod';
import { parseGradeLevel } from './grade-level';
import { resolveInstrument } from './instrument-names';

/** The longest name (first, last, preferred, guardian) a roster row keeps. */
export const longestName = 80;

/** The longest ensemble name a roster row keeps. */
export const longestEnsembleName = 80;

/** The longest district student id a roster row keeps. */
export const longestStudentId = 40;

const studentIdCharacters = /^[A-Za-z0-9_-]+$/;
const schoolCodeCharacters = /^[A-Z0-9]{2,10}$/;
const whitespaceRun = /\s+/g;
const emailSchema = z.email();

/** A value as it appears in a message: quoted, and cut short when long. */
export function quoteValue(value: string): string {
  return `'${value.length > 40 ? `${value.slice(0, 39)}…` : value}'`;
}

type Check<Output> = (text: string) => Output | { problem: string };

// A cell arrives as text (CSV), a number (a form or JSON) or nothing. Every text field is
// trimmed and its runs of white space, line breaks included, become one space.
function cellField<Output>(label: string, check: Check<Output>) {
  return z
    .union([z.string(), z.number()], { error: `${label} must be text.` })
    .nullish()
    .transform((value, context) => {
      const text = value == null ? '' : String(value).replace(whitespaceRun, ' ').trim();
      const result = check(text);
      if (typeof result === 'object' && result !== null && 'problem' in result) {
        context.issues.push({ code: 'custom', message: result.problem, input: value });
        return z.NEVER;
      }
      return result as Output;
    });
}

function requiredName(label: string) {
  return cellField(label, (text) => {
    if (text === '') return { problem: `${label} is required.` };
    if (text.length > longestName) {
      return { problem: `${label} is longer than ${longestName} characters.` };
    }
    return text;
  });
}

function optionalText(label: string, longest: number) {
  return cellField(label, (text) => {
    if (text.length > longest) return { problem: `${label} is longer than ${longest} characters.` };
    return text === '' ? undefined : text;
  }).optional();
}

const studentId = cellField('Student ID', (text) => {
  if (text === '') return { problem: 'Student ID is required.' };
  if (text.length > longestStudentId) {
    return {
      problem: `Student ID ${quoteValue(text)} is longer than ${longestStudentId} characters.`,
    };
  }
  if (!studentIdCharacters.test(text)) {
    return {
      problem: `Student ID ${quoteValue(text)} may contain only letters, digits, '-' and '_'.`,
    };
  }
  return text;
});

const grade = z
  .union([z.string(), z.number()], { error: 'Grade must be K or 1 to 12.' })
  .nullish()
  .transform((value, context) => {
    const text = value == null ? '' : String(value).trim();
    const parsed = text === '' ? null : parseGradeLevel(typeof value === 'number' ? value : text);
    if (parsed === null) {
      const message =
        text === '' ? 'Grade is required.' : `Grade must be K or 1 to 12; got ${quoteValue(text)}.`;
      context.issues.push({ code: 'custom', message, input: value });
      return z.NEVER;
    }
    return parsed;
  });

// School codes are compared in upper case: "hpms" in a hand-made file is HPMS.
const schoolCode = cellField('School code', (text) => {
  if (text === '') return { problem: 'School code is required.' };
  const code = text.toUpperCase();
  if (!schoolCodeCharacters.test(code)) {
    return {
      problem: `School code ${quoteValue(text)} must be 2 to 10 letters or digits, e.g. 'HPMS'.`,
    };
  }
  return code;
});

const instrument = cellField('Instrument', (text) => {
  if (text === '') return undefined;
  return (
    resolveInstrument(text) ?? {
      problem: `Instrument ${quoteValue(text)} is not one we know; use an instrument id or its usual name, e.g. 'Alto Saxophone'.`,
    }
  );
}).optional();

const guardianEmail = cellField('Guardian e-mail', (text) => {
  if (text === '') return undefined;
  if (!emailSchema.safeParse(text).success) {
    return { problem: `Guardian e-mail ${quoteValue(text)} is not a valid e-mail address.` };
  }
  return text;
}).optional();

/**
 * One normalised roster row: a student in one ensemble (or in none). Takes cells as text (or
 * numbers), trims them, and gives every problem in words a coordinator understands. The grade
 * comes out as 0 (kindergarten) to 12, the school code in upper case, the instrument as an
 * instrument id, and empty optional cells as absent.
 */
export const rosterRowSchema = z.object({
  studentId,
  firstName: requiredName('First name'),
  lastName: requiredName('Last name'),
  preferredName: optionalText('Preferred name', longestName),
  grade,
  schoolCode,
  ensemble: optionalText('Ensemble', longestEnsembleName),
  instrument,
  guardianName: optionalText('Guardian name', longestName),
  guardianEmail,
});

/** A roster row after validation. */
export type RosterRow = z.output<typeof rosterRowSchema>;

/** What {@link rosterRowSchema} accepts: each field as text, a number, or nothing. */
export type RosterRowInput = z.input<typeof rosterRowSchema>;
