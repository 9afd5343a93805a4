import type {
  Ladder,
  LadderBenchmark,
  LadderPatch,
  LadderRequirement,
  LadderRung,
} from '@shared/api/ladder';
import { isMinor, majorTonics, minorTonics, type Mode } from '@shared/music';

/** The benchmarks as the editor holds them: dates across, grades down, a rung in each cell. */
export interface BenchmarkGrid {
  checkpoints: string[];
  rows: { grade: number; rungs: (number | null)[] }[];
}

/** A draft as the editor changes it before saving. */
export interface DraftModel {
  name: string;
  rungs: LadderRung[];
  benchmarks: BenchmarkGrid;
}

/** Field errors by their API path ('rungs.0.requirements.2.tempo'). */
export type FieldErrors = ReadonlyMap<string, string>;

/** The API's message as the editor shows it under a field: led by a warning sign; '' for none. */
export function warningText(message: string | undefined): string {
  return message ? `⚠ ${message}` : '';
}

/** The tonics offered for a mode: the 15 minor keys for a minor scale, else the 15 major. */
export function tonicsForMode(mode: Mode): readonly string[] {
  return isMinor(mode) ? minorTonics : majorTonics;
}

/** The code a requirement gets from its rung and key, as the demo ladder names them: 'r2-bb-major'. */
export function derivedCode(
  rungNumber: number,
  requirement: Pick<LadderRequirement, 'tonic' | 'mode'>,
): string {
  const tonic = requirement.tonic.toLowerCase().replace(/#/g, 's');
  return `r${rungNumber}-${tonic}-${requirement.mode}`;
}

/** A code not yet used in the draft: the derived one, or it with '-2', '-3'… */
export function freeCode(model: DraftModel, wanted: string, except?: LadderRequirement): string {
  const used = new Set(
    model.rungs.flatMap((rung) =>
      rung.requirements
        .filter((requirement) => requirement !== except)
        .map((requirement) => requirement.code),
    ),
  );
  if (!used.has(wanted)) return wanted;
  let suffix = 2;
  while (used.has(`${wanted}-${suffix}`)) suffix++;
  return `${wanted}-${suffix}`;
}

/**
 * A new, empty requirement for a rung: no key chosen yet (saving asks for one), the plainest
 * pattern and articulation, every family. Its code follows the key once the key is chosen.
 */
export function newRequirement(): LadderRequirement {
  return {
    code: '',
    tonic: '',
    mode: 'major',
    pattern: 'long-tones',
    tempo: 60,
    articulation: 'tongued',
    octaves: 1,
    optional: false,
    families: null,
  };
}

/** Numbers the rungs 1, 2, 3… in their order. */
export function renumbered(rungs: LadderRung[]): LadderRung[] {
  return rungs.map((rung, index) => ({ ...rung, number: index + 1 }));
}

/** The editor's model of a ladder version. */
export function toModel(ladder: Ladder): DraftModel {
  return {
    name: ladder.name,
    rungs: structuredClone(ladder.rungs),
    benchmarks: toBenchmarkGrid(ladder.benchmarks),
  };
}

/** The benchmark list laid out as a grid of grades by dates. */
export function toBenchmarkGrid(benchmarks: readonly LadderBenchmark[]): BenchmarkGrid {
  const checkpoints = [...new Set(benchmarks.map((benchmark) => benchmark.byDate))].sort();
  const grades = [...new Set(benchmarks.map((benchmark) => benchmark.grade))].sort((a, b) => a - b);
  return {
    checkpoints,
    rows: grades.map((grade) => ({
      grade,
      rungs: checkpoints.map(
        (byDate) =>
          benchmarks.find((benchmark) => benchmark.grade === grade && benchmark.byDate === byDate)
            ?.rung ?? null,
      ),
    })),
  };
}

/**
 * The benchmark list the API takes, in grid order, with where each entry sits in the grid so a
 * field error on `benchmarks.<index>` can be shown in its cell.
 */
export function benchmarkList(grid: BenchmarkGrid): {
  benchmarks: LadderBenchmark[];
  cells: string[];
} {
  const benchmarks: LadderBenchmark[] = [];
  const cells: string[] = [];
  grid.rows.forEach((row, rowIndex) =>
    row.rungs.forEach((rung, column) => {
      if (rung === null) return;
      benchmarks.push({ grade: row.grade, rung, byDate: grid.checkpoints[column] ?? '' });
      cells.push(`${rowIndex}.${column}`);
    }),
  );
  return { benchmarks, cells };
}

/** The PATCH that saves the model over the draft at `version`. */
export function toPatch(model: DraftModel, version: number): LadderPatch {
  return {
    name: model.name,
    rungs: renumbered(model.rungs),
    benchmarks: benchmarkList(model.benchmarks).benchmarks,
    version,
  };
}

/**
 * The API's field errors keyed for the editor: rung and requirement paths stay as they are;
 * `benchmarks.<index>…` becomes `benchmark.<row>.<column>` for the grid cell it came from.
 */
export function editorErrors(
  fieldErrors: readonly { field: string; message: string }[],
  model: DraftModel,
): Map<string, string> {
  const cells = benchmarkList(model.benchmarks).cells;
  const errors = new Map<string, string>();
  for (const { field, message } of fieldErrors) {
    const benchmark = /^benchmarks\.(\d+)/.exec(field);
    const key = benchmark ? `benchmark.${cells[Number(benchmark[1])] ?? 'all'}` : field;
    if (!errors.has(key)) errors.set(key, message);
  }
  return errors;
}
