import type { BundleFiles } from './oneroster-files';
import type { RowError } from './parsed-roster';

/** The OneRoster CSV versions a roster import reads. */
export type OneRosterVersion = '1.1' | '1.2';

/** How the manifest says a file is sent: the whole data set, changes only, or not at all. */
export type FileMode = 'bulk' | 'delta' | 'absent';

/** The files a roster import reads, besides the manifest. */
export const rosterBundleFiles = [
  'orgs.csv',
  'users.csv',
  'roles.csv',
  'classes.csv',
  'enrollments.csv',
] as const;

/** One of {@link rosterBundleFiles}. */
export type RosterBundleFile = (typeof rosterBundleFiles)[number];

/** What a bundle's manifest says, and the problems that stop the bundle from being read. */
export interface BundleLayout {
  version: OneRosterVersion;
  /** How each file is sent; a file the manifest leaves out counts as absent. */
  modes: Map<RosterBundleFile, FileMode>;
  /** Whether any file is a delta: the bundle then lists changes only. */
  delta: boolean;
  problems: RowError[];
}

// The columns this import cannot do without, by version. OneRoster 1.1 CSV Tables (1EdTech,
// 2017; v1.1.1 2023) §2.1 and OneRoster 1.2 CSV Binding (1EdTech, 2022) §3: users.csv in 1.1
// carries role and orgSourcedIds; in 1.2 they moved to roles.csv (userSourcedId, roleType, role,
// orgSourcedId) and users.csv gained primaryOrgSourcedId, preferredFirstName and
// userMasterIdentifier. Column names here are from memory of both specifications.
const neededColumns: Readonly<
  Record<OneRosterVersion, Partial<Record<RosterBundleFile | 'manifest.csv', readonly string[]>>>
> = {
  '1.1': {
    'manifest.csv': ['propertyName', 'value'],
    'orgs.csv': ['sourcedId', 'name', 'type'],
    'users.csv': ['sourcedId', 'orgSourcedIds', 'role', 'givenName', 'familyName'],
    'classes.csv': ['sourcedId', 'title', 'schoolSourcedId'],
    'enrollments.csv': ['sourcedId', 'classSourcedId', 'userSourcedId', 'role'],
  },
  '1.2': {
    'manifest.csv': ['propertyName', 'value'],
    'orgs.csv': ['sourcedId', 'name', 'type'],
    'users.csv': ['sourcedId', 'givenName', 'familyName'],
    'roles.csv': ['userSourcedId', 'role', 'orgSourcedId'],
    'classes.csv': ['sourcedId', 'title', 'schoolSourcedId'],
    'enrollments.csv': ['sourcedId', 'classSourcedId', 'userSourcedId', 'role'],
  },
};

// The files a bulk bundle must hold: without them the roster has no students or no schools.
const requiredInBulk: Readonly<Record<OneRosterVersion, readonly RosterBundleFile[]>> = {
  '1.1': ['orgs.csv', 'users.csv', 'classes.csv', 'enrollments.csv'],
  '1.2': ['orgs.csv', 'users.csv', 'roles.csv', 'classes.csv', 'enrollments.csv'],
};

// OneRoster 1.1 CSV Tables §2.2 and 1.2 CSV Binding §3.1 (manifest.csv): property "file.<name>"
// (file.orgs, file.users, file.roles, …) takes "absent", "bulk" or "delta".
function manifestKey(file: RosterBundleFile): string {
  return `file.${file.replace(/\.csv$/, '')}`;
}

/** The version a manifest's `oneroster.version` names, or undefined when it is not one we read. */
export function versionOf(value: string): OneRosterVersion | undefined {
  // "1.1" and "1.2" per the specifications; exports also write "1.2.0" or "v1p2".
  const normalised = value.trim().toLowerCase().replace(/^v/, '').replace('p', '.');
  if (/^1\.1(\.\d+)?$/.test(normalised)) return '1.1';
  if (/^1\.2(\.\d+)?$/.test(normalised)) return '1.2';
  return undefined;
}

/** The columns the version needs that a file of the bundle lacks. */
function missingColumns(files: BundleFiles['files'], version: OneRosterVersion): RowError[] {
  const problems: RowError[] = [];
  for (const [name, columns] of Object.entries(neededColumns[version])) {
    const csv = files.get(name as RosterBundleFile | 'manifest.csv');
    if (!csv) continue;
    const present = new Set(csv.headers);
    for (const column of columns) {
      if (present.has(column)) continue;
      problems.push({
        line: 1,
        column: `${name}:${column}`,
        message:
          version === '1.2' && name === 'users.csv'
            ? `users.csv has no '${column}' column (OneRoster 1.2).`
            : `${name} has no '${column}' column.`,
      });
    }
  }
  return problems;
}

/**
 * Reads the manifest: which OneRoster version the bundle is (1.1 or 1.2) and how each file is
 * sent. A bundle without manifest.csv is read as 1.1 bulk when it holds 1.1's users.csv (with a
 * `role` column) and as 1.2 when it holds roles.csv, but the manifest's absence is reported.
 */
export function readBundleLayout(files: BundleFiles['files']): BundleLayout {
  const problems: RowError[] = [];
  const manifest = files.get('manifest.csv');
  const properties = new Map<string, { value: string; line: number }>();
  for (const record of manifest?.records ?? []) {
    const name = (record.cells.propertyName ?? '').trim();
    properties.set(name, { value: (record.cells.value ?? '').trim(), line: record.line });
  }
  if (!manifest) {
    problems.push({
      line: 0,
      column: 'manifest.csv',
      message: 'The bundle has no manifest.csv; a OneRoster CSV bundle starts with one.',
    });
  }
  const declared = properties.get('oneroster.version');
  let version: OneRosterVersion = files.has('roles.csv') ? '1.2' : '1.1';
  if (declared) {
    const known = versionOf(declared.value);
    if (known) version = known;
    else {
      problems.push({
        line: declared.line,
        column: 'manifest.csv:value',
        message: `The bundle is OneRoster version '${declared.value}'; this import reads OneRoster 1.1 and 1.2 CSV bundles.`,
      });
    }
  }

  const modes = new Map<RosterBundleFile, FileMode>();
  for (const file of rosterBundleFiles) {
    const entry = properties.get(manifestKey(file));
    const value = entry?.value.toLowerCase();
    if (entry && value !== 'bulk' && value !== 'delta' && value !== 'absent') {
      problems.push({
        line: entry.line,
        column: 'manifest.csv:value',
        message: `manifest.csv gives ${manifestKey(file)} as '${entry.value}'; it must be bulk, delta or absent.`,
      });
      continue;
    }
    // Without a manifest entry, a file that is there is read as bulk (as a 1.1 bundle always was).
    modes.set(file, (value as FileMode | undefined) ?? (files.has(file) ? 'bulk' : 'absent'));
  }
  const delta = [...modes.values()].includes('delta');

  for (const file of requiredInBulk[version]) {
    const mode = modes.get(file);
    const entry = properties.get(manifestKey(file));
    // A delta may leave out what did not change; a bulk bundle needs every roster file.
    if (delta && mode === 'absent') continue;
    if (entry && mode === 'absent') {
      problems.push({
        line: entry.line,
        column: 'manifest.csv:value',
        message: `manifest.csv says ${file} is absent; a bulk roster import needs it.`,
      });
    } else if (files.has(file)) {
      continue;
    } else if (!entry) {
      problems.push({ line: 0, column: file, message: `The bundle has no ${file}.` });
    } else {
      problems.push({
        line: entry.line,
        column: 'manifest.csv:value',
        message: `manifest.csv lists ${file} as ${mode}, but the bundle has no ${file}.`,
      });
    }
  }
  problems.push(...missingColumns(files, version));
  return { version, modes, delta, problems };
}

/** Orders bundle errors by file (in the order given, '' for the whole bundle), then line. */
export function byFileAndLine(order: readonly string[]) {
  const rank = (error: RowError) => order.indexOf(error.column.split(':')[0]);
  return (first: RowError, second: RowError) =>
    rank(first) - rank(second) || first.line - second.line;
}
