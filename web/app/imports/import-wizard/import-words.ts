import type { ImportResult } from '@shared/api/import';

/** A count and the noun phrase that goes with it ("1 row", "4 rows"). */
export function counted(count: number, one: string, many: string): string {
  return `${count.toLocaleString('en-US')} ${count === 1 ? one : many}`;
}

/**
 * What a committed import did, in one sentence: row counts (the rows with errors skipped are
 * rows, however many errors each had) and the students withdrawn.
 */
export function importDoneSentence(result: ImportResult): string {
  const skipped = result.rows - result.created - result.updated - result.unchanged;
  const parts = [
    counted(result.created, 'row added a new student', 'rows added new students'),
    counted(result.updated, 'changed student', 'changed students'),
    `${result.unchanged.toLocaleString('en-US')} unchanged`,
    counted(result.withdrawn, 'student was marked withdrawn', 'students were marked withdrawn'),
  ];
  const sentence = parts.join(', ');
  return skipped > 0
    ? `${sentence}; ${counted(skipped, 'row with errors was skipped', 'rows with errors were skipped')}.`
    : `${sentence}.`;
}

/** What the commit is doing while it runs, from the plan's counts. */
export function commitActivity(plan: {
  created: number;
  updated: number;
  withdrawn: number;
  newEnsembles: unknown[];
}): string {
  const work = [
    plan.created > 0
      ? `adding ${counted(plan.created, 'row of new students', 'rows of new students')}`
      : '',
    plan.updated > 0 ? `writing ${counted(plan.updated, 'changed row', 'changed rows')}` : '',
    plan.newEnsembles.length > 0
      ? `creating ${counted(plan.newEnsembles.length, 'ensemble', 'ensembles')}`
      : '',
    plan.withdrawn > 0 ? `marking ${counted(plan.withdrawn, 'student', 'students')} withdrawn` : '',
  ].filter(Boolean);
  const doing = work.length > 0 ? work.join(', ') : 'checking every row against the roster';
  return `${doing.charAt(0).toUpperCase()}${doing.slice(1)}… Nothing changes until the whole import is written.`;
}
