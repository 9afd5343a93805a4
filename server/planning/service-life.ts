/**
 * Years of service a school instrument is planned to give before replacement, by family. These
 * are planning figures of our own, common practice, no source: woodwinds wear fastest (pads,
 * keywork), brass and strings last longer with care, mallet percussion frames longest.
 */
export const serviceLifeYears: Record<string, number> = {
  woodwind: 12,
  brass: 15,
  strings: 20,
  percussion: 20,
  other: 15,
};

/** The planned service life of a family, in years. */
export function serviceLifeOf(family: string): number {
  return serviceLifeYears[family] ?? serviceLifeYears['other']!;
}
