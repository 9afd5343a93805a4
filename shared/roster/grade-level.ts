/** The grade number a roster stores for kindergarten; grades 1 to 12 are stored as themselves. */
export const kindergarten = 0;

/** The highest grade a roster accepts. */
export const highestGrade = 12;

// Accepts "K", "KG", "Kindergarten", "5", "05", "5th", "Grade 5", "Gr. 5", "5th Grade", "Grade K";
// CEDS entry-grade codes write kindergarten "KG" and grades "01" to "12".
const gradeText =
  /^(?:(?:grade|gr\.?)\s*)?(k|kg|kindergarten|\d{1,2})(?:\s*(?:st|nd|rd|th))?(?:\s*grade)?$/i;

/**
 * The grade a roster cell names, 0 (kindergarten) to 12, or null when it names no grade from K to
 * 12. A plain 0 is read as kindergarten, as some student information systems write it.
 */
export function parseGradeLevel(cell: string | number): number | null {
  if (typeof cell === 'number') {
    return Number.isInteger(cell) && cell >= kindergarten && cell <= highestGrade ? cell : null;
  }
  const match = gradeText.exec(cell.trim());
  if (!match) return null;
  const grade = match[1].toLowerCase();
  if (grade.startsWith('k')) return kindergarten;
  const number = Number(grade);
  return number <= highestGrade ? number : null;
}

/** How a roster writes a stored grade: "K" for kindergarten, otherwise the number. */
export function formatGradeLevel(grade: number): string {
  return grade === kindergarten ? 'K' : String(grade);
}
