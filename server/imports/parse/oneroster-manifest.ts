import type { BundleFiles } from './oneroster-files';
import type { RowError } from './parsed-roster';

/** The files a roster import cannot do without. */
export const requiredBundleFiles = [
  'orgs.csv',
  'users.csv',
  'classes.csv',
  'enrollments.csv',
] as const;

// The columns this import reads from each file. OneRoster 1.1 CSV Tables (1EdTech, 2017;
// v1.1.1 2023) define more; these lists are from memory, cross-checked with open-source
// importers, and should be confirmed against the specification text.
const neededColumns: Readonly<
  Record<(typeof requiredBundleFiles)[number] | 'manifest.csv', readonly string[]>
> = {
  'manifest.csv': ['propertyName', 'value'],
  'orgs.csv': ['sourcedId', 'name', 'type', 'identifier'],
  'users.csv': ['sourcedId', 'orgSourcedIds', 'role', 'givenName', 'familyName', 'grades'],
  'classes.csv': ['sourcedId', 'title', 'schoolSourcedId'],
  'enrollments.csv': ['sourcedId', 'classSourcedId', 'schoolSourcedId', 'userSourcedId', 'role'],
};

// OneRoster 1.1 CSV manifest: "oneroster.version" is "1.1"; "file.<name>" is "absent", "bulk"
// (the whole data set) or "delta" (only changes since the last exchange).
const manifestFileKey: Readonly<Record<(typeof requiredBundleFiles)[number], string>> = {
  'orgs.csv': 'file.orgs',
  'users.csv': 'file.users',
  'classes.csv': 'file.classes',
  'enrollments.csv': 'file.enrollments',
};

function checkManifest(files: BundleFiles['files'], errors: RowError[]): void {
  const manifest = files.get('manifest.csv');
  if (!manifest) {
    errors.push({
      line: 0,
      column: 'manifest.csv',
      message: 'The bundle has no manifest.csv; a OneRoster 1.1 CSV bundle starts with one.',
    });
    return;
  }
  const properties = new Map<string, { value: string; line: number }>();
  for (const record of manifest.records) {
    const name = (record.cells.propertyName ?? '').trim();
    properties.set(name, { value: (record.cells.value ?? '').trim(), line: record.line });
  }
  const version = properties.get('oneroster.version');
  if (version && version.value !== '1.1') {
    errors.push({
      line: version.line,
      column: 'manifest.csv:value',
      message: `The bundle is OneRoster version '${version.value}'; this import reads OneRoster 1.1 CSV bundles.`,
    });
  }
  for (const file of requiredBundleFiles) {
    const mode = properties.get(manifestFileKey[file]);
    const kind = mode?.value.toLowerCase();
    if (!mode || (kind !== 'delta' && kind !== 'absent')) continue;
    errors.push({
      line: mode.line,
      column: 'manifest.csv:value',
      message:
        kind === 'delta'
          ? `manifest.csv says ${file} is a delta (changes only); export a bulk bundle so that every student is listed.`
          : `manifest.csv says ${file} is absent; a roster import needs it.`,
    });
  }
}

/**
 * The problems that stop a bundle from being read at all: no manifest, a version other than
 * 1.1, a delta or absent file, a missing file, a file without a column the import needs.
 */
export function bundleStructureProblems(files: BundleFiles['files']): RowError[] {
  const errors: RowError[] = [];
  checkManifest(files, errors);
  for (const name of ['manifest.csv', ...requiredBundleFiles] as const) {
    const csv = files.get(name);
    if (!csv) {
      if (name !== 'manifest.csv') {
        errors.push({ line: 0, column: name, message: `The bundle has no ${name}.` });
      }
      continue;
    }
    const present = new Set(csv.headers);
    for (const column of neededColumns[name]) {
      if (present.has(column)) continue;
      errors.push({
        line: 1,
        column: `${name}:${column}`,
        message: `${name} has no '${column}' column.`,
      });
    }
  }
  return errors;
}

/** Orders bundle errors by file (in the order given, '' for the whole bundle), then line. */
export function byFileAndLine(order: readonly string[]) {
  const rank = (error: RowError) => order.indexOf(error.column.split(':')[0]);
  return (first: RowError, second: RowError) =>
    rank(first) - rank(second) || first.line - second.line;
}
