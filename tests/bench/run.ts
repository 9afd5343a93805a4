import fs from 'node:fs';
import os from 'node:os';
import { execSync, spawn } from 'node:child_process';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { printFigures, type BenchFigure } from './bench-figure';
import { benchGridPages } from './grid-pages';
import { benchStartup } from './startup';
import { benchBundle } from './bundle';
import { benchListening } from './listening';
import { benchBackup } from './backup';
import { benchPhoneProfile } from './phone-profile';

/**
 * `npm run bench`: every figure against the limit measured in the same run, printed as ratios.
 * `--smoke` runs small sizes (part of `npm test`, so the benchmarks cannot rot);
 * `--write-results` records the run in tests/bench/RESULTS.md. Each section runs in a process
 * of its own (see `inOwnProcess`).
 */
const smoke = process.argv.includes('--smoke');
const writeResults = process.argv.includes('--write-results');
/** `--only=4,5` runs just those sections (by their number), for working on one figure. */
const only = process.argv
  .find((arg) => arg.startsWith('--only='))
  ?.slice('--only='.length)
  .split(',');

type Section = { title: string; run: () => Promise<BenchFigure[]> | BenchFigure[] };

async function optionalModule<Module>(path: string): Promise<Module | undefined> {
  return fs.existsSync(new URL(path, import.meta.url))
    ? ((await import(path)) as Module)
    : undefined;
}

async function sections(): Promise<Section[]> {
  const rosterImport = await optionalModule<{
    benchRosterImport(options: { rows: number }): Promise<BenchFigure[]>;
  }>('./roster-import.ts');
  const analytics = await optionalModule<{
    benchAnalytics(options: { students: number; passOffs: number }): Promise<BenchFigure[]>;
  }>('./analytics.ts');
  const concurrency = await optionalModule<{
    benchConcurrency(options: { students: number; rows: number }): Promise<BenchFigure[]>;
  }>('./concurrency.ts');
  const list: Section[] = [];
  if (rosterImport) {
    list.push({
      title: '1. Roster import, end to end, against COPY into PGlite',
      run: () => rosterImport.benchRosterImport({ rows: smoke ? 500 : 20_000 }),
    });
  }
  list.push({
    title: '2. Grid pages through HTTP, against the same SQL run directly',
    run: () => benchGridPages({ students: smoke ? 3_000 : 50_000, runs: smoke ? 5 : 100 }),
  });
  if (analytics) {
    list.push({
      title: '3. Overview analytics, against the same SQL run directly',
      run: () =>
        analytics.benchAnalytics(
          smoke ? { students: 2_000, passOffs: 10_000 } : { students: 50_000, passOffs: 500_000 },
        ),
    });
  }
  if (concurrency) {
    list.push({
      title: '4. Grid pages during an import, against without it',
      run: () =>
        concurrency.benchConcurrency(
          smoke ? { students: 3_000, rows: 500 } : { students: 50_000, rows: 20_000 },
        ),
    });
  }
  list.push({
    title: '5. Start-up on an existing data folder',
    run: () => benchStartup({ students: smoke ? 2_000 : 50_000 }),
  });
  if (!smoke)
    list.push({
      title: '6. Initial JavaScript and CSS against an empty Material app',
      run: () => benchBundle({ rebuild: true }),
    });
  list.push({
    title: '8. Listening: a take analysed, against one pass of the pitch detector',
    run: () => benchListening(smoke ? { seconds: 15, runs: 1 } : { seconds: 60, runs: 7 }),
  });
  if (!smoke && rosterImport) {
    list.push({
      title: '7. Growth: import and a grid page at 5,000 / 20,000 / 50,000 students',
      run: async () => {
        const figures: BenchFigure[] = [];
        for (const size of [5_000, 20_000, 50_000]) {
          const [importFigure] = await rosterImport.benchRosterImport({ rows: size });
          const [pageFigure] = await benchGridPages({ students: size, runs: 100 });
          figures.push(
            { ...importFigure!, name: `import ${size.toLocaleString('en-US')} rows` },
            { ...pageFigure!, name: `default page at ${size.toLocaleString('en-US')} students` },
          );
        }
        return figures;
      },
    });
  }
  list.push({
    title: '9. Grid pages during a backup, against without it',
    run: () =>
      benchBackup(smoke ? { students: 3_000, photos: 5 } : { students: 50_000, photos: 200 }),
  });
  const yearStart = await optionalModule<{
    benchYearStart(options: { students: number }): Promise<BenchFigure[]>;
  }>('./year-start.ts');
  if (yearStart) {
    list.push({
      title:
        '10. Starting a new school year, against one grade update over the same students; year over year after it',
      run: () => yearStart.benchYearStart({ students: smoke ? 2_000 : 50_000 }),
    });
  }
  const loadTail = await optionalModule<{
    benchLoadTail(options: { clients: number; seconds: number }): Promise<BenchFigure[]>;
  }>('./load-tail.ts');
  if (loadTail) {
    list.push({
      title: '11. A steady tail: many clients on the demo district, against one client alone',
      run: () =>
        loadTail.benchLoadTail(smoke ? { clients: 10, seconds: 3 } : { clients: 50, seconds: 30 }),
    });
  }
  list.push({
    title: '12. Pass-off screen on a phone profile (CPU ×4, Fast 3G), against its limits',
    run: () => benchPhoneProfile({ runs: smoke ? 1 : 3 }),
  });
  return list;
}

/**
 * Runs one section in a Node process of its own (this script with `--only=N`), so what one
 * section leaves behind (a heap grown by an import, engines' memory) does not weigh on the next:
 * run in one process, the grid pages' overhead grew section by section (about 5–8 ms at p95
 * alone, 8–13 ms after the sections before them). Answers the figures the child wrote.
 */
async function inOwnProcess(section: Section): Promise<BenchFigure[]> {
  const number = section.title.split('.')[0]!;
  const figuresFile = path.join(os.tmpdir(), `tutti-bench-${process.pid}-${number}.json`);
  const args = [
    ...process.execArgv,
    fileURLToPath(import.meta.url),
    `--only=${number}`,
    `--figures-to=${figuresFile}`,
    ...(smoke ? ['--smoke'] : []),
  ];
  const code = await new Promise<number | null>((resolve, reject) => {
    const child = spawn(process.execPath, args, { stdio: 'inherit' });
    child.on('error', reject);
    child.on('exit', resolve);
  });
  if (code !== 0) throw new Error(`Section ${section.title} ended with exit code ${code}.`);
  try {
    return JSON.parse(fs.readFileSync(figuresFile, 'utf8')) as BenchFigure[];
  } finally {
    fs.rmSync(figuresFile, { force: true });
  }
}

/** `--figures-to=FILE` (set by {@link inOwnProcess}): where a section's figures go as JSON. */
const figuresTo = process.argv
  .find((arg) => arg.startsWith('--figures-to='))
  ?.slice('--figures-to='.length);

const results: { title: string; figures: BenchFigure[] }[] = [];
const chosen = (await sections()).filter(
  (section) => !only || only.includes(section.title.split('.')[0]!),
);
for (const section of chosen) {
  if (chosen.length > 1) {
    // The child prints its own table.
    results.push({ title: section.title, figures: await inOwnProcess(section) });
    continue;
  }
  const figures = await section.run();
  printFigures(section.title, figures);
  results.push({ title: section.title, figures });
  if (figuresTo) fs.writeFileSync(figuresTo, JSON.stringify(figures));
}

if (writeResults && !only) {
  const commit = execSync('git rev-parse --short HEAD').toString().trim();
  const lines = [
    '# Benchmark results',
    '',
    `Run on ${new Date().toISOString().slice(0, 10)}, commit ${commit}, ${os.cpus().length} × ${os.cpus()[0]?.model ?? 'CPU'}, ${Math.round(os.totalmem() / 2 ** 30)} GiB, Node ${process.version}.`,
    'Each figure is the product against the limit measured in the same run; the ratio is product ÷ limit.',
    '',
  ];
  for (const { title, figures } of results) {
    lines.push(
      `## ${title}`,
      '',
      '| figure | product | limit | ratio | note |',
      '| --- | ---: | ---: | ---: | --- |',
    );
    for (const f of figures)
      lines.push(
        `| ${f.name} | ${f.product_ms} ${f.unit ?? 'ms'} | ${f.limit_ms} ${f.unit ?? 'ms'} | ${f.ratio}× | ${f.note ?? ''} |`,
      );
    lines.push('');
  }
  const notes = fs.existsSync('tests/bench/NOTES.md')
    ? fs.readFileSync('tests/bench/NOTES.md', 'utf8')
    : '';
  fs.writeFileSync('tests/bench/RESULTS.md', `${lines.join('\n')}\n${notes}`);
}
process.exit(0);
