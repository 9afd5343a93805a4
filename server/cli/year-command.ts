import type { Config } from '../config';
import { HttpError } from '../core/errors';
import { fieldErrorsOf } from '../core/validate';
import { startSchoolYear } from '../school-years/year-start';
import {
  yearStartCountsSchema,
  yearStartInputSchema,
  type YearStartInput,
  type YearStartResult,
} from '@shared/api/school-year';
import { CommandError } from './command-error';
import { withCommandDatabase } from './command-database';
import { callRunningServer, runningServer } from './running-server';

const valueFlags = new Set(['--starts', '--ends']);
const switchFlags = new Set(['--dry-run', '--json', '--empty-ensembles']);

function parseArguments(args: string[]) {
  const [action, ...rest] = args;
  if (action !== 'start')
    throw new CommandError(`Unknown year command '${action ?? ''}'; try 'tutti year start'.`);
  const names: string[] = [];
  const values = new Map<string, string>();
  const switches = new Set<string>();
  for (let index = 0; index < rest.length; index += 1) {
    const arg = rest[index]!;
    if (valueFlags.has(arg)) {
      const value = rest[index + 1];
      if (value === undefined || value.startsWith('--'))
        throw new CommandError(`${arg} needs a date (YYYY-MM-DD).`);
      values.set(arg, value);
      index += 1;
    } else if (switchFlags.has(arg)) switches.add(arg);
    else if (arg.startsWith('--')) throw new CommandError(`Unknown option '${arg}'.`);
    else names.push(arg);
  }
  if (names.length !== 1) throw new CommandError('Name exactly one new year, e.g. 2027-28.');
  const parsed = yearStartInputSchema.safeParse({
    name: names[0],
    startsOn: values.get('--starts'),
    endsOn: values.get('--ends'),
    emptyEnsembles: switches.has('--empty-ensembles'),
  });
  if (!parsed.success) {
    const problems = fieldErrorsOf(parsed.error).map(
      (error) => `${flagOf(error.field)}: ${error.message}`,
    );
    throw new CommandError(problems.join('\n'));
  }
  return { input: parsed.data, dryRun: switches.has('--dry-run'), json: switches.has('--json') };
}

function flagOf(field: string): string {
  return { name: 'name', startsOn: '--starts', endsOn: '--ends' }[field] ?? field;
}

/** The contract's one JSON object: the year, its counts, and whether it was committed. */
function contractJson(result: YearStartResult): string {
  const counts = yearStartCountsSchema.parse(result);
  return JSON.stringify({ year: result.year, ...counts, committed: result.committed });
}

function summary(result: YearStartResult, dryRun: boolean): string {
  const lines = [
    `School year ${result.year} (${result.startsOn} to ${result.endsOn}), after ${result.fromYear}: ${result.students} active students.`,
    `  promoted ${result.promoted}, graduated ${result.graduated}, moving up ${result.movingUp}, leaving ${result.leaving}`,
    `  ensembles ${result.ensembles}, seats carried ${result.seats}${result.emptyEnsembles ? ' (ensembles start empty)' : ''}`,
    `  open loans carried ${result.loansCarried}, due back for the summer return ${result.loansDueBack}`,
  ];
  for (const school of result.schools.filter((row) => row.students > 0)) {
    lines.push(
      `  ${school.code}: ${school.students} students; promoted ${school.promoted}, graduated ${school.graduated}, moving up ${school.movingUp}${school.sendsTo ? ` to ${school.sendsTo}` : ''}, leaving ${school.leaving}`,
    );
  }
  if (result.unplaced.length > 0) {
    lines.push(`Students with no school to move up to (marked leaving):`);
    for (const student of result.unplaced)
      lines.push(
        `  ${student.studentNumber} ${student.name} (${student.schoolCode}, grade ${student.grade})`,
      );
  }
  lines.push(
    result.committed
      ? `Committed: ${result.year} is the current year; ${result.fromYear} is history.`
      : dryRun
        ? 'Dry run: nothing was written; run again without --dry-run to start the year.'
        : 'Nothing was written.',
  );
  return `${lines.join('\n')}\n`;
}

async function throughServer(
  server: { url: string; key: string },
  input: YearStartInput,
  dryRun: boolean,
) {
  const answer = await callRunningServer<YearStartResult & { error?: { message: string } }>(
    server,
    '/years/start',
    {
      method: 'POST',
      body: JSON.stringify({ ...input, dryRun }),
      contentType: 'application/json',
    },
  );
  if (answer.status === 400)
    throw new CommandError(answer.body.error?.message ?? 'The server refused the year.');
  if (answer.status !== 200)
    throw new CommandError(
      answer.body.error?.message ?? `The server answered ${answer.status}.`,
      1,
    );
  return answer.body;
}

/**
 * `tutti year start <name> --starts YYYY-MM-DD --ends YYYY-MM-DD [--dry-run] [--json]
 * [--empty-ensembles]`: previews, then starts, the new school year in one transaction. Works
 * through the running server when one holds the data folder. Exit 0 when committed or a clean
 * dry run; 2 for a bad command or a year that exists, overlaps or is not after the current one.
 */
export async function yearCommand(config: Config, args: string[]): Promise<number> {
  const options = parseArguments(args);
  const server = runningServer(config);
  let result: YearStartResult;
  try {
    result = server
      ? await throughServer(server, options.input, options.dryRun)
      : await withCommandDatabase(config, `tutti year start ${options.input.name}`, ({ db }) =>
          startSchoolYear(db, null, options.input, { commit: !options.dryRun }),
        );
  } catch (error) {
    if (error instanceof HttpError && error.status === 400) throw new CommandError(error.message);
    throw error;
  }
  process.stdout.write(
    options.json ? `${contractJson(result)}\n` : summary(result, options.dryRun),
  );
  return 0;
}

export const yearUsage =
  'tutti year start <name> --starts YYYY-MM-DD --ends YYYY-MM-DD [--dry-run] [--json] [--empty-ensembles]';
