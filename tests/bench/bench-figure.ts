/** One measured figure: the product's time, the limit's time in the same run, and their ratio. */
export interface BenchFigure {
  name: string;
  product_ms: number;
  limit_ms: number;
  ratio: number;
  /** What the two numbers count; milliseconds unless said. */
  unit?: string;
  /** The target, in words, and anything that explains the figure. */
  note?: string;
}

/** A figure from two timings. */
export function figure(
  name: string,
  productMs: number,
  limitMs: number,
  note?: string,
  unit = 'ms',
): BenchFigure {
  return {
    name,
    product_ms: round(productMs),
    limit_ms: round(limitMs),
    ratio: round(productMs / Math.max(limitMs, 0.001)),
    unit,
    note,
  };
}

export function round(value: number): number {
  return Math.round(value * 100) / 100;
}

/** The p-th percentile (0–100) of some timings. */
export function percentile(values: number[], p: number): number {
  const sorted = [...values].sort((a, b) => a - b);
  if (sorted.length === 0) return NaN;
  const index = Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1));
  return sorted[index]!;
}

/** Times an async function once, in milliseconds. */
export async function time(work: () => Promise<unknown>): Promise<number> {
  const start = performance.now();
  await work();
  return performance.now() - start;
}

/** Times an async function several times (after warm-ups) and answers every timing. */
export async function timings(
  work: () => Promise<unknown>,
  runs: number,
  warmups = 2,
): Promise<number[]> {
  for (let index = 0; index < warmups; index += 1) await work();
  const results: number[] = [];
  for (let index = 0; index < runs; index += 1) results.push(await time(work));
  return results;
}

/** Prints figures as an aligned table. */
export function printFigures(title: string, figures: BenchFigure[]): void {
  process.stdout.write(`\n${title}\n`);
  const header = ['figure', 'product', 'limit', 'ratio', 'note'];
  const rows = figures.map((f) => [
    f.name,
    `${f.product_ms.toFixed(2)} ${f.unit ?? 'ms'}`,
    `${f.limit_ms.toFixed(2)} ${f.unit ?? 'ms'}`,
    `${f.ratio.toFixed(2)}×`,
    f.note ?? '',
  ]);
  const widths = header.map((cell, column) =>
    Math.max(cell.length, ...rows.map((row) => row[column]!.length)),
  );
  const line = (cells: string[]) =>
    cells
      .map((cell, column) =>
        column === 0 || column === 4
          ? cell.padEnd(widths[column]!)
          : cell.padStart(widths[column]!),
      )
      .join('  ');
  process.stdout.write(`${line(header)}\n${widths.map((width) => '-'.repeat(width)).join('  ')}\n`);
  for (const row of rows) process.stdout.write(`${line(row)}\n`);
}
