import { formatGradeLevel } from './grade-level';
import { rosterColumnNames, rosterFields } from './roster-columns';
import type { RosterRow } from './roster-row';

// OWASP "CSV Injection": a cell starting with = + - @ tab or carriage return may run as a formula
// in a spreadsheet. Single quotes already in front count too, so that reading undoes writing.
const formulaStart = /^'*[=+\-@\t\r]/;
const neutralisedStart = /^'+[=+\-@\t\r]/;
// RFC 4180 section 2: a field holding a comma, a double quote or a line break is quoted.
const needsQuotes = /[",\r\n]/;
const doubleQuote = /"/g;
const singleQuote = 0x27;

/**
 * A cell made safe to open in a spreadsheet, per OWASP "CSV Injection": a cell that starts with
 * `=`, `+`, `-`, `@`, a tab or a carriage return (after any single quotes) gets a single quote in
 * front, so the spreadsheet shows it as text. Every CSV the product exports passes its cells here.
 */
export function neutraliseFormula(cell: string): string {
  return formulaStart.test(cell) ? `'${cell}` : cell;
}

/**
 * The cell {@link neutraliseFormula} was given: drops the single quote it put in front of a
 * formula character. Importers apply it so that an exported roster reads back unchanged.
 */
export function restoreNeutralisedCell(cell: string): string {
  return cell.charCodeAt(0) === singleQuote && neutralisedStart.test(cell) ? cell.slice(1) : cell;
}

/** One CSV field per RFC 4180, neutralised against formulas first. */
export function csvField(cell: string): string {
  const safe = neutraliseFormula(cell);
  return needsQuotes.test(safe) ? `"${safe.replace(doubleQuote, '""')}"` : safe;
}

function rosterCells(row: RosterRow): string[] {
  return rosterFields.map((field) => {
    if (field === 'grade') return formatGradeLevel(row.grade);
    return row[field] ?? '';
  });
}

/**
 * A roster as CSV text: the roster's own column names (`student_id`, `first_name`, …), one
 * record per row, fields quoted per RFC 4180 where needed, CRLF line breaks (RFC 4180 section 2),
 * and every cell neutralised against spreadsheet formulas. Grades are written "K" or 1 to 12.
 */
export function toRosterCsv(rows: RosterRow[]): string {
  const lines = [rosterFields.map((field) => rosterColumnNames[field]).join(',')];
  for (const row of rows) lines.push(rosterCells(row).map(csvField).join(','));
  return `${lines.join('\r\n')}\r\n`;
}
