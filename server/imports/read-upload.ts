import { readFile, stat } from 'node:fs/promises';
import type { ColumnMapping } from '@shared/roster';
import { decodeText } from './parse/decode';
import { readBundleFiles } from './parse/oneroster-files';
import { readOneRosterBundle } from './parse/oneroster';
import type { OrgMatching } from './parse/oneroster-orgs';
import { parseCsvYielding } from './parse/parse-csv';
import { detectRosterKind, parseRosterCsvYielding } from './parse/parse-roster';
import type { ParsedRoster } from './parse/parsed-roster';

/** An uploaded roster: a CSV file or a zipped OneRoster bundle, as bytes, or a bundle folder. */
export type RosterUpload = { fileName: string; bytes: Uint8Array } | { folder: string };

/**
 * What reading an upload needs: the coordinator's mapping, the district's school codes, and (for
 * a OneRoster bundle) the schools by name and the orgs mapped at earlier imports.
 */
export interface ReadOptions extends OrgMatching {
  mapping?: ColumnMapping;
  knownSchoolCodes: ReadonlySet<string>;
}

/** The name an upload is shown and recorded under. */
export function uploadName(upload: RosterUpload): string {
  return 'folder' in upload
    ? (upload.folder.split(/[\\/]/).filter(Boolean).pop() ?? upload.folder)
    : upload.fileName;
}

/** Reads an upload into validated rows: a zip or folder as a OneRoster bundle, else as CSV. */
export async function readRosterUpload(
  upload: RosterUpload,
  options: ReadOptions,
): Promise<ParsedRoster> {
  const checks = { knownSchoolCodes: options.knownSchoolCodes };
  const bundleChecks = {
    ...checks,
    schoolCodeByName: options.schoolCodeByName,
    schoolCodeByOrg: options.schoolCodeByOrg,
  };
  if ('folder' in upload) return readOneRosterBundle(upload.folder, bundleChecks);
  if (detectRosterKind(upload.fileName, upload.bytes) === 'zip')
    return readOneRosterBundle(upload.bytes, bundleChecks);
  return parseRosterCsvYielding(upload.bytes, { ...checks, mapping: options.mapping });
}

/**
 * Every student id the upload lists, in valid rows or not, so that a student whose row has an
 * error is never taken for one the file leaves out.
 */
export async function listedStudentIds(
  upload: RosterUpload,
  parsed: ParsedRoster,
): Promise<Set<string>> {
  const ids = new Set(parsed.rows.map(({ row }) => row.studentId));
  if (parsed.source === 'oneroster') {
    const input = 'folder' in upload ? upload.folder : upload.bytes;
    const users = (await readBundleFiles(input)).files.get('users.csv');
    for (const record of users?.records ?? []) {
      for (const column of ['identifier', 'userMasterIdentifier', 'sourcedId']) {
        const id = (record.cells[column] ?? '').trim();
        if (id) ids.add(id);
      }
    }
    return ids;
  }
  const column = parsed.mapping.studentId;
  if (!column || 'folder' in upload) return ids;
  for (const record of (await parseCsvYielding(decodeText(upload.bytes).text)).records) {
    const id = (record.cells[column] ?? '').trim();
    if (id) ids.add(id);
  }
  return ids;
}

/** Thrown when a path given to `tutti import` cannot be read at all. */
export class UnreadableUploadError extends Error {}

/** The upload at a path: a folder is a OneRoster bundle, a file is read as bytes. */
export async function uploadFromPath(path: string): Promise<RosterUpload> {
  try {
    if ((await stat(path)).isDirectory()) return { folder: path };
    return {
      fileName: path.split(/[\\/]/).pop() ?? path,
      bytes: new Uint8Array(await readFile(path)),
    };
  } catch (error) {
    const reason =
      (error as NodeJS.ErrnoException).code === 'ENOENT'
        ? 'there is no such file'
        : (error as Error).message;
    throw new UnreadableUploadError(`Cannot read '${path}': ${reason}.`);
  }
}
