/**
 * The median worked out the plain way, to check the product's medians against: sort, take the
 * middle value or the mean of the two middle ones (the definition PostgreSQL's
 * percentile_cont(0.5) follows); null for no values.
 */
export function plainMedian(values: readonly number[]): number | null {
  if (values.length === 0) return null;
  const sorted = [...values].sort((a, b) => a - b);
  const middle = sorted.length / 2;
  return sorted.length % 2
    ? sorted[Math.floor(middle)]!
    : (sorted[middle - 1]! + sorted[middle]!) / 2;
}
