/** A small seeded pseudo-random generator (mulberry32), so the demo district is the same every time. */
export class SeededRandom {
  private state: number;

  constructor(seed: number) {
    this.state = seed >>> 0;
  }

  /** A number in [0, 1). */
  next(): number {
    this.state = (this.state + 0x6d2b79f5) >>> 0;
    let value = this.state;
    value = Math.imul(value ^ (value >>> 15), value | 1);
    value ^= value + Math.imul(value ^ (value >>> 7), value | 61);
    return ((value ^ (value >>> 14)) >>> 0) / 4294967296;
  }

  /** A whole number in [low, high]. */
  integer(low: number, high: number): number {
    return low + Math.floor(this.next() * (high - low + 1));
  }

  pick<Item>(items: readonly Item[]): Item {
    return items[Math.floor(this.next() * items.length)]!;
  }

  /** Picks by weight: [[item, weight], …]. */
  weighted<Item>(choices: readonly (readonly [Item, number])[]): Item {
    const total = choices.reduce((sum, [, weight]) => sum + weight, 0);
    let roll = this.next() * total;
    for (const [item, weight] of choices) {
      roll -= weight;
      if (roll < 0) return item;
    }
    return choices[choices.length - 1]![0];
  }

  chance(probability: number): boolean {
    return this.next() < probability;
  }
}
