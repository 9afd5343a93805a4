import { describe, expect, it } from 'vitest';
import { rungsOnDay } from './rung-by-grade';

/** A small seeded generator (Park and Miller's minimal standard, CACM 31(10), 1988). */
function generator(seed: number) {
  let state = seed;
  return (below: number) => {
    state = (state * 16_807) % 2_147_483_647;
    return state % below;
  };
}

const day = (offset: number) =>
  new Date(Date.UTC(2026, 7, 17) + offset * 86_400_000).toISOString().slice(0, 10);

/** Students' rung dates: ascending, some rungs reached on the same day, some before any day. */
function students(seed: number, count: number): string[][] {
  const next = generator(seed);
  return Array.from({ length: count }, () => {
    const dates: string[] = [];
    const before = next(4) === 0 ? 1 + next(2) : 0;
    for (let k = 0; k < before; k += 1) dates.push('-infinity');
    let offset = next(30);
    for (let k = next(7); k > 0; k -= 1) {
      dates.push(day(offset));
      offset += next(3) === 0 ? 0 : 1 + next(60);
    }
    return dates;
  });
}

describe('rungsOnDay', () => {
  it("should answer each student's count of rung dates up to the day, from the counts alone", () => {
    for (const seed of [1, 7, 42, 2026]) {
      const dates = students(seed, 300);
      for (const asOf of [day(-1), day(0), day(45), day(120), day(400)]) {
        // The plain answer: each student's rung is how many of their dates fall on or before the
        // day (ISO dates compare as strings; '-infinity' is before every day).
        const plain = new Map<number, number>();
        for (const list of dates) {
          const rung = list.filter((reached) => reached === '-infinity' || reached <= asOf).length;
          plain.set(rung, (plain.get(rung) ?? 0) + 1);
        }
        // The counts the triggers keep: students by number of dates, and dates after the day by rung.
        const dated = new Map<number, number>();
        const after = new Map<number, number>();
        for (const list of dates) {
          dated.set(list.length, (dated.get(list.length) ?? 0) + 1);
          list.forEach((reached, index) => {
            if (reached !== '-infinity' && reached > asOf)
              after.set(index + 1, (after.get(index + 1) ?? 0) + 1);
          });
        }
        expect(
          rungsOnDay(
            [...dated].sort(([a], [b]) => a - b),
            after,
          ),
        ).toEqual([...plain].sort(([a], [b]) => a - b));
      }
    }
  });

  it('should answer nobody when there are no students', () => {
    expect(rungsOnDay([], new Map())).toEqual([]);
  });
});
