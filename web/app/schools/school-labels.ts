import type { School } from '@shared/api/school';

/** How each school level reads on screen. */
export const schoolLevelLabels: Record<School['level'], string> = {
  elementary: 'Elementary',
  middle: 'Middle',
  high: 'High',
  'k-8': 'K–8',
  other: 'Other',
};

/** The fields `GET /api/schools?sort=<field>:asc|desc` accepts. */
export const schoolSortFields = ['code', 'name', 'level', 'studentCount', 'ensembleCount'] as const;
