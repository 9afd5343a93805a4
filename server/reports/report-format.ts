import { formatGradeLevel } from '@shared/roster/grade-level';
import type { ReportData, ReportFigures } from '@shared/api/report';

/** A share from 0 to 1 as a whole percentage, or a dash. */
export function percent(share: number | null): string {
  return share === null ? '–' : `${Math.round(share * 100)}%`;
}

/** A count, or a dash when it is not available. */
export function countText(value: number | null): string {
  return value === null ? '–' : String(value);
}

/** "Grade 7", or "Kindergarten". */
export function gradeLabel(grade: number): string {
  return grade === 0 ? 'Kindergarten' : `Grade ${formatGradeLevel(grade)}`;
}

/** The change of a count since the last report: "+3", "−2", "no change", or a dash. */
export function countChange(now: number | null, before: number | null): string {
  if (now === null || before === null) return '–';
  const difference = now - before;
  if (difference === 0) return 'no change';
  return difference > 0 ? `+${difference}` : `−${Math.abs(difference)}`;
}

/** The change of a share in percentage points: "+4 pts". */
export function shareChange(now: number | null, before: number | null): string {
  if (now === null || before === null) return '–';
  const points = Math.round(now * 100) - Math.round(before * 100);
  if (points === 0) return 'no change';
  return points > 0 ? `+${points} pts` : `−${Math.abs(points)} pts`;
}

/** The rows of the district summary's figures, with their labels and how each is shown. */
export const figureRows: { field: keyof ReportFigures; label: string; share?: boolean }[] = [
  { field: 'students', label: 'Students' },
  { field: 'atOrAboveShare', label: 'At or above benchmark', share: true },
  { field: 'passOffsHeard', label: 'Pass-offs heard' },
  { field: 'passOffsPassed', label: 'Pass-offs passed' },
  { field: 'stalled', label: 'Stalled students' },
  { field: 'auditionReady', label: 'Audition-ready' },
  { field: 'instrumentsOut', label: 'Instruments out' },
  { field: 'overdue', label: 'Overdue' },
  { field: 'inRepair', label: 'In repair' },
  { field: 'unsigned', label: 'Unsigned agreements' },
];

/** One figure as text. */
export function figureText(figures: ReportFigures, field: keyof ReportFigures): string {
  const value = figures[field];
  return field === 'atOrAboveShare' ? percent(value) : countText(value);
}

/** The message's subject line. */
export function reportSubject(data: ReportData): string {
  const period = `${data.from} to ${data.to}`;
  return data.kind === 'director'
    ? `${data.school.name} (${data.school.code}): director report, ${period}`
    : `District summary, ${period}`;
}

/** A loan's overdue and agreement cells, as the report's tables and files word them. */
export function loanFlags(loan: { overdue: boolean; signed: boolean }): [string, string] {
  return [loan.overdue ? 'yes' : 'no', loan.signed ? 'signed' : 'unsigned'];
}
