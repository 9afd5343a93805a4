import type { StudentStatus } from '@shared/api/student';

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
