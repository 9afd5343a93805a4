import { readdir, readFile, stat } from 'node:fs/promises';
import { join } from 'node:path';
import { unzipSync } from 'fflate';
import { decodeText } from './decode';
import { parseCsv, type ParsedCsv } from './parse-csv';
import type { RowError } from './parsed-roster';

/**
 * The OneRoster CSV files a roster import reads (1EdTech OneRoster 1.1 CSV Tables §2; OneRoster
 * 1.2 CSV Binding §3 adds roles.csv). Every other file of a bundle (userProfiles.csv,
 * demographics.csv, lineItems.csv, …) is left unread without complaint.
 */
export const bundleFileNames = [
  'manifest.csv',
  'orgs.csv',
  'users.csv',
  'roles.csv',
  'classes.csv',
  'enrollments.csv',
  'courses.csv',
  'academicSessions.csv',
] as const;

/** One of {@link bundleFileNames}. */
export type BundleFileName = (typeof bundleFileNames)[number];

/** What a OneRoster bundle can be given as: zip bytes, a folder path, or file name → content. */
export type BundleInput = Uint8Array | string | ReadonlyMap<string, string | Uint8Array>;

/** The bundle's files, parsed, and the problems met reading them. */
export interface BundleFiles {
  files: Map<BundleFileName, ParsedCsv>;
  errors: RowError[];
}

// A roster export of a whole district stays far below these; a larger entry, or a bundle whose
// files add up to more, is refused by the sizes the zip declares, before anything is inflated.
// fflate inflates an entry into a buffer of its declared size and no further, so a zip that
// understates a size (a zip bomb's trick) yields a cut-off file, never more memory.
const largestFile = 256 * 1024 * 1024;
/** The most the bundle's roster files may add up to once inflated. */
export const largestBundle = 256 * 1024 * 1024;

const canonicalName = new Map<string, BundleFileName>(
  bundleFileNames.map((name) => [name.toLowerCase(), name]),
);

function bundleName(path: string): BundleFileName | undefined {
  const base = path.split(/[\\/]/).pop() ?? '';
  return canonicalName.get(base.toLowerCase());
}

function wholeBundle(message: string): RowError {
  return { line: 0, column: '', message };
}

function fromZip(bytes: Uint8Array, errors: RowError[]): Map<string, Uint8Array | string> {
  const found = new Map<string, Uint8Array | string>();
  let entries: Record<string, Uint8Array>;
  let workbook = false;
  let declared = 0;
  try {
    // First the sizes the zip declares, from its directory alone; nothing is inflated yet.
    unzipSync(bytes, {
      filter: (file) => {
        if (bundleName(file.name) && file.originalSize <= largestFile)
          declared += file.originalSize;
        return false;
      },
    });
    if (declared > largestBundle) {
      errors.push(
        wholeBundle(
          'The roster files in this zip add up to more than 256 MB once unpacked; nothing was read. Export only the OneRoster CSV files, or split the export.',
        ),
      );
      return found;
    }
    // Only the bundle's own CSV files are inflated: a nested zip or anything else is skipped.
    entries = unzipSync(bytes, {
      filter: (file) => {
        if (file.name === 'xl/workbook.xml') workbook = true;
        if (!bundleName(file.name)) return false;
        if (file.originalSize > largestFile) {
          errors.push(wholeBundle(`${file.name} is larger than 256 MB and was not read.`));
          return false;
        }
        return true;
      },
    });
  } catch (error) {
    const reason = error instanceof Error ? error.message : String(error);
    errors.push(wholeBundle(`The zip file could not be read (${reason}).`));
    return found;
  }
  if (workbook) {
    errors.push(
      wholeBundle('This is an Excel workbook, not a OneRoster bundle; save the sheet as CSV.'),
    );
  }
  for (const [path, content] of Object.entries(entries)) found.set(path, content);
  return found;
}

async function fromFolder(folder: string, errors: RowError[]): Promise<Map<string, Uint8Array>> {
  const found = new Map<string, Uint8Array>();
  try {
    if (!(await stat(folder)).isDirectory()) {
      errors.push(wholeBundle(`'${folder}' is not a folder.`));
      return found;
    }
    for (const entry of await readdir(folder)) {
      if (bundleName(entry)) found.set(entry, await readFile(join(folder, entry)));
    }
  } catch (error) {
    const reason = error instanceof Error ? error.message : String(error);
    errors.push(wholeBundle(`The folder '${folder}' could not be read (${reason}).`));
  }
  return found;
}

/**
 * Reads and parses the OneRoster files of a bundle. File names are matched without regard to
 * case or sub-folder; other files are ignored; each file's encoding and delimiter are detected
 * as for a plain roster, and its layout problems are reported with `file.csv:column` columns.
 */
export async function readBundleFiles(input: BundleInput): Promise<BundleFiles> {
  const errors: RowError[] = [];
  const raw =
    typeof input === 'string'
      ? await fromFolder(input, errors)
      : input instanceof Uint8Array
        ? fromZip(input, errors)
        : input;
  const files = new Map<BundleFileName, ParsedCsv>();
  for (const [path, content] of raw) {
    const name = bundleName(path);
    if (!name) continue;
    if (files.has(name)) {
      errors.push(wholeBundle(`The bundle holds more than one ${name}; only the first was read.`));
      continue;
    }
    const csv = parseCsv(typeof content === 'string' ? content : decodeText(content).text);
    for (const problem of csv.problems) {
      errors.push({ ...problem, column: `${name}:${problem.column}` });
    }
    files.set(name, csv);
  }
  return { files, errors };
}
