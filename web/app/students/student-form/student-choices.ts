import type { StudentStatus } from '@shared/api/student';
import { choicesOf } from '../../core/grid/filter-select/filter-select';

/** The grades a student can be in: 0 is kindergarten, written K. */
export const gradeChoices: { value: number; label: string }[] = Array.from(
  { length: 13 },
  (_, grade) => ({
    value: grade,
    label: grade === 0 ? 'K' : String(grade),
  }),
);

/** How each student status reads on screen. */
export const statusLabels: Record<StudentStatus, string> = {
  active: 'Active',
  withdrawn: 'Withdrawn',
  graduated: 'Graduated',
  leaving: 'Left the district',
};

/** The statuses a director sets by hand (the year start sets the others). */
export const statusChoices = choicesOf<StudentStatus>(
  ['active', 'withdrawn'],
  (status) => statusLabels[status],
);
