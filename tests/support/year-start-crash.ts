// Starts a school year on a data folder the way `tutti year start` does, and kills its own
// process (SIGKILL: no clean-up code runs) right after the step named in YEAR_START_CRASH_AT,
// inside the start's transaction. A test uses it to crash a start half-way through.
import { loadConfig } from '../../server/config';
import { withCommandDatabase } from '../../server/cli/command-database';
import { startSchoolYear, type YearStartStep } from '../../server/school-years/year-start';

const crashAt = process.env['YEAR_START_CRASH_AT'] as YearStartStep;
const [name, startsOn, endsOn] = process.argv.slice(2) as [string, string, string];
await withCommandDatabase(loadConfig(), 'year start crash test', ({ db }) =>
  startSchoolYear(
    db,
    null,
    { name, startsOn, endsOn, emptyEnsembles: false },
    {
      commit: true,
      onStep: (step) => {
        process.stdout.write(`${step}\n`);
        if (step === crashAt) process.kill(process.pid, 'SIGKILL');
      },
    },
  ),
);
process.stdout.write('finished\n');
