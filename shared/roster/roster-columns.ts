/** The fields of a roster row, in the order of the roster CSV's columns. */
export const rosterFields = [
  'studentId',
  'firstName',
  'lastName',
  'preferredName',
  'grade',
  'schoolCode',
  'ensemble',
  'instrument',
  'guardianName',
  'guardianEmail',
] as const;

/** One field of a roster row. */
export type RosterField = (typeof rosterFields)[number];

/** Which file header feeds each roster field; a field with no header is not imported. */
export type ColumnMapping = Partial<Record<RosterField, string>>;

/** The roster CSV's own column name for each field (a fixed contract). */
export const rosterColumnNames: Readonly<Record<RosterField, string>> = {
  studentId: 'student_id',
  firstName: 'first_name',
  lastName: 'last_name',
  preferredName: 'preferred_name',
  grade: 'grade',
  schoolCode: 'school_code',
  ensemble: 'ensemble',
  instrument: 'instrument',
  guardianName: 'guardian_name',
  guardianEmail: 'guardian_email',
};

/** How each field is named to a coordinator. */
export const rosterFieldLabels: Readonly<Record<RosterField, string>> = {
  studentId: 'Student ID',
  firstName: 'First name',
  lastName: 'Last name',
  preferredName: 'Preferred name',
  grade: 'Grade',
  schoolCode: 'School code',
  ensemble: 'Ensemble',
  instrument: 'Instrument',
  guardianName: 'Guardian name',
  guardianEmail: 'Guardian e-mail',
};

/** The fields every roster must have a column for. */
export const requiredRosterFields: readonly RosterField[] = [
  'studentId',
  'firstName',
  'lastName',
  'grade',
  'schoolCode',
];

// Headers student information systems commonly export for each field, most specific first
// (common practice, no source). "#" is read as "number", so "Student #" is "Student Number".
const headerSynonyms: Readonly<Record<RosterField, readonly string[]>> = {
  studentId: [
    'Student ID',
    'Student Number',
    'Student No',
    'Local Student ID',
    'District Student ID',
    'Local ID',
    'District ID',
    'SIS ID',
    'Student Local ID',
    'Pupil ID',
    'ID',
  ],
  firstName: ['First Name', 'Legal First Name', 'Student First Name', 'Given Name', 'First'],
  lastName: ['Last Name', 'Legal Last Name', 'Student Last Name', 'Surname', 'Family Name', 'Last'],
  preferredName: [
    'Preferred Name',
    'Preferred First Name',
    'Nickname',
    'Nick Name',
    'Goes By',
    'Known As',
  ],
  grade: ['Grade', 'Grade Level', 'Current Grade', 'Grade Lvl', 'Gr', 'Year Level'],
  schoolCode: [
    'School Code',
    'School ID',
    'School Number',
    'School Abbreviation',
    'Building Code',
    'Site Code',
    'School',
    'Building',
    'Site',
  ],
  ensemble: [
    'Ensemble',
    'Ensemble Name',
    'Class',
    'Class Name',
    'Class Title',
    'Course',
    'Course Name',
    'Course Title',
    'Section',
  ],
  instrument: ['Instrument', 'Primary Instrument', 'Instrument Name', 'Main Instrument'],
  guardianName: [
    'Guardian Name',
    'Guardian',
    'Parent Name',
    'Parent',
    'Parent/Guardian Name',
    'Parent/Guardian',
    'Guardian 1 Name',
    'Parent 1 Name',
    'Primary Contact Name',
    'Primary Contact',
    'Contact Name',
  ],
  guardianEmail: [
    'Guardian Email',
    'Parent Email',
    'Parent/Guardian Email',
    'Guardian 1 Email',
    'Parent 1 Email',
    'Primary Contact Email',
    'Contact Email',
    'Family Email',
  ],
};

const numberSign = /#/g;
const notLetterOrDigit = /[^a-z0-9]+/g;
const eMail = /e-mail/g;

/** A header in the form headers are compared in: lower case, letters and digits only. */
export function comparableHeader(header: string): string {
  return header
    .toLowerCase()
    .replace(eMail, 'email')
    .replace(numberSign, ' number ')
    .replace(notLetterOrDigit, '');
}

// For each field, the comparable forms of its names in order of preference, the column name first.
const preferredForms: ReadonlyArray<readonly [RosterField, readonly string[]]> = rosterFields.map(
  (field) => [field, [rosterColumnNames[field], ...headerSynonyms[field]].map(comparableHeader)],
);

/**
 * A first guess at which header feeds each field, matching the roster CSV's column names and the
 * headers student information systems commonly export ("Student Number", "Legal First Name",
 * "Grade Level", "Parent/Guardian Email"), ignoring case, spaces, underscores and punctuation.
 * A header feeds at most one field; a field takes the first header that matches its most
 * specific name.
 */
export function guessMapping(headers: string[]): ColumnMapping {
  const headerByForm = new Map<string, string>();
  for (const header of headers) {
    const form = comparableHeader(header);
    if (form !== '' && !headerByForm.has(form)) headerByForm.set(form, header);
  }
  const taken = new Set<string>();
  const mapping: ColumnMapping = {};
  // Exact column names are settled first so that a synonym never takes a canonical column.
  for (const pass of ['column name', 'synonym'] as const) {
    for (const [field, forms] of preferredForms) {
      if (mapping[field] !== undefined) continue;
      for (const form of pass === 'column name' ? forms.slice(0, 1) : forms.slice(1)) {
        const header = headerByForm.get(form);
        if (header !== undefined && !taken.has(header)) {
          mapping[field] = header;
          taken.add(header);
          break;
        }
      }
    }
  }
  const ordered: ColumnMapping = {};
  for (const field of rosterFields)
    if (mapping[field] !== undefined) ordered[field] = mapping[field];
  return ordered;
}

/** Something about a column mapping that stops an import. */
export interface MappingProblem {
  field: RosterField;
  message: string;
}

/**
 * What is wrong with a mapping: required fields with no column, a column that feeds two fields,
 * and (when the file's headers are given) a mapped header the file does not have.
 */
export function mappingProblems(mapping: ColumnMapping, headers?: string[]): MappingProblem[] {
  const problems: MappingProblem[] = [];
  const known = headers ? new Set(headers) : undefined;
  const fieldByHeader = new Map<string, RosterField>();
  for (const field of rosterFields) {
    const header = mapping[field];
    const label = rosterFieldLabels[field];
    if (header === undefined || header === '') {
      if (requiredRosterFields.includes(field)) {
        problems.push({
          field,
          message: `The file has no ${label} column (${rosterColumnNames[field]}); add one or choose the column that holds it.`,
        });
      }
      continue;
    }
    if (known && !known.has(header)) {
      problems.push({ field, message: `The file has no column '${header}' for ${label}.` });
      continue;
    }
    const other = fieldByHeader.get(header);
    if (other) {
      problems.push({
        field,
        message: `Column '${header}' is chosen for both ${rosterFieldLabels[other]} and ${label}.`,
      });
    } else {
      fieldByHeader.set(header, field);
    }
  }
  return problems;
}
