/** One field of an audited row, before and after a change. */
export interface AuditFieldChange {
  field: string;
  before: string;
  after: string;
  changed: boolean;
}

function shown(value: unknown): string {
  if (value === undefined) return '';
  if (value === null) return '—';
  if (typeof value === 'string') return value;
  return JSON.stringify(value);
}

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

/**
 * The fields of an audit entry's before and after, side by side, changed ones marked. A value
 * that is not an object (or is missing) shows as one field named "value".
 */
export function auditFieldChanges(before: unknown, after: unknown): AuditFieldChange[] {
  const beforeFields = isRecord(before) ? before : before == null ? {} : { value: before };
  const afterFields = isRecord(after) ? after : after == null ? {} : { value: after };
  const fields = [...new Set([...Object.keys(beforeFields), ...Object.keys(afterFields)])];
  return fields.map((field) => {
    const was = shown(beforeFields[field]);
    const now = shown(afterFields[field]);
    return { field, before: was, after: now, changed: was !== now };
  });
}

const describingFields = ['name', 'label', 'title', 'email', 'code', 'assetTag', 'studentNumber'];

/** A few words naming the audited row, from its own fields (a person's name, a school's code). */
export function auditSubject(before: unknown, after: unknown): string {
  for (const row of [after, before]) {
    if (!isRecord(row)) continue;
    for (const field of describingFields) {
      const value = row[field];
      if (typeof value === 'string' && value.trim()) return value;
    }
  }
  return '';
}

/** What each audited kind of row is called on screen. */
export const auditEntityLabels: Record<string, string> = {
  user: 'Person',
  'api-token': 'API token',
  school: 'School',
  student: 'Student',
  ensemble: 'Ensemble',
  enrollment: 'Enrollment',
  'pass-off': 'Pass-off',
  'ladder-version': 'Scale ladder',
  instrument: 'Instrument',
  loan: 'Loan',
  repair: 'Repair',
  count: 'Annual count',
  'report-schedule': 'Report schedule',
};

/** The on-screen name of an audited kind of row. */
export function auditEntityLabel(entity: string): string {
  return (
    auditEntityLabels[entity] ??
    entity.charAt(0).toUpperCase() + entity.slice(1).replaceAll('-', ' ')
  );
}
