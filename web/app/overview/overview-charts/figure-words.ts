const months = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

/** A grade as a director says it: "Kindergarten", "Grade 6". */
export function gradeLabel(grade: number): string {
  return grade === 0 ? 'Kindergarten' : `Grade ${grade}`;
}

/** A rung on the ladder: "None yet" for students who have passed no rung. */
export function rungLabel(rung: number): string {
  return rung === 0 ? 'None yet' : `Rung ${rung}`;
}

/** A share from 0 to 1 as a whole percentage, or a dash when there is nothing to share. */
export function percentText(share: number | null): string {
  return share === null ? '—' : `${Math.round(share * 100)}%`;
}

/** An ISO date as "Jan 31", read as a calendar day whatever the browser's time zone. */
export function shortDate(isoDate: string): string {
  const [, month, day] = isoDate.split('-').map(Number);
  return `${months[(month ?? 1) - 1]} ${day}`;
}

/** A count with its noun: "1 student", "12 students". */
export function countText(count: number, noun: string, plural = `${noun}s`): string {
  return `${count.toLocaleString('en-US')} ${count === 1 ? noun : plural}`;
}
