import type { LadderBenchmark } from '@shared/api/ladder';
import { dateText } from './date-text';

/** The benchmarks as a table: one row per grade, one column per date. */
export interface BenchmarkTable {
  columns: { byDate: string; label: string }[];
  rows: { grade: number; rungs: (number | null)[] }[];
}

/**
 * Lays the benchmarks out by grade and date. With exactly two dates the columns read as the
 * school year's two checkpoints, mid-year and year-end.
 */
export function benchmarkTable(benchmarks: readonly LadderBenchmark[]): BenchmarkTable {
  const dates = [...new Set(benchmarks.map((benchmark) => benchmark.byDate))].sort();
  const grades = [...new Set(benchmarks.map((benchmark) => benchmark.grade))].sort((a, b) => a - b);
  const names = dates.length === 2 ? ['Mid-year', 'Year-end'] : [];
  return {
    columns: dates.map((byDate, index) => ({
      byDate,
      label: names[index] ? `${names[index]} · by ${dateText(byDate)}` : `By ${dateText(byDate)}`,
    })),
    rows: grades.map((grade) => ({
      grade,
      rungs: dates.map(
        (byDate) =>
          benchmarks.find((benchmark) => benchmark.grade === grade && benchmark.byDate === byDate)
            ?.rung ?? null,
      ),
    })),
  };
}
