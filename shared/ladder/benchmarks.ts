/** The rung a grade should have reached by a date. */
export interface Benchmark {
  grade: number;
  rung: number;
  /** ISO date, YYYY-MM-DD. */
  byDate: string;
}

/**
 * The benchmark in force for each grade on a day: the one with the latest date not after that
 * day, or, before the first date of the year, the grade's first benchmark.
 */
export function benchmarksInForce(
  benchmarks: readonly Benchmark[],
  asOf: string,
): Map<number, Benchmark> {
  const inForce = new Map<number, Benchmark>();
  const byDate = [...benchmarks].sort((first, second) => first.byDate.localeCompare(second.byDate));
  for (const benchmark of byDate) {
    const known = inForce.get(benchmark.grade);
    if (!known || benchmark.byDate <= asOf) inForce.set(benchmark.grade, benchmark);
  }
  return inForce;
}
