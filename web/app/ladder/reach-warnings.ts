import type { LadderBenchmark, LadderRung } from '@shared/api/ladder';
import {
  instruments,
  keyName,
  levelOfGrade,
  levelReach,
  schoolLevelNames,
  type SchoolLevel,
} from '@shared/music';

/** A requirement some section cannot play at the grades expected to reach its rung. */
export interface ReachWarning {
  rung: number;
  code: string;
  /** 'Rung 4, concert C major (two octaves): out of reach in middle school (grade 6 …)'. */
  heading: string;
  /** One line per instrument: the engine's "Cannot fit this level" message. */
  details: string[];
}

/**
 * The requirements that some instrument of the families they apply to cannot place inside the
 * school range of the youngest grade expected to reach their rung (a benchmark for that grade
 * at that rung or above). School ranges grow with the level, so a requirement that fits the
 * youngest level fits the older ones too.
 */
export function reachWarnings(
  rungs: LadderRung[],
  benchmarks: Pick<LadderBenchmark, 'grade' | 'rung'>[],
): ReachWarning[] {
  const warnings: ReachWarning[] = [];
  for (const rung of rungs) {
    const grades = benchmarks
      .filter((benchmark) => benchmark.rung >= rung.number)
      .map(({ grade }) => grade);
    if (grades.length === 0) continue;
    const youngest = Math.min(...grades);
    const level: SchoolLevel = levelOfGrade(youngest);
    for (const requirement of rung.requirements) {
      // A requirement just added has no key yet: nothing to place until one is chosen.
      if (!/^[A-G](#{1,2}|b{1,2})?$/.test(requirement.tonic)) continue;
      const key = { tonic: requirement.tonic, mode: requirement.mode };
      const details = instruments
        .filter(({ family }) => !requirement.families || requirement.families.includes(family))
        .flatMap((instrument) => {
          const reach = levelReach(
            { pattern: requirement.pattern, key, octaves: requirement.octaves },
            instrument.id,
            level,
          );
          return reach.fits ? [] : [`${instrument.name}: ${reach.message}`];
        });
      if (details.length === 0) continue;
      const octaves = requirement.octaves === 2 ? 'two octaves' : 'one octave';
      const grade = youngest === 0 ? 'kindergarten' : `grade ${youngest}`;
      warnings.push({
        rung: rung.number,
        code: requirement.code,
        heading:
          `Rung ${rung.number}, concert ${keyName(key)} (${octaves}): out of reach for ` +
          `${details.length === 1 ? 'one instrument' : `${details.length} instruments`} in ` +
          `${schoolLevelNames[level]} (${grade} is expected to reach this rung)`,
        details,
      });
    }
  }
  return warnings;
}
