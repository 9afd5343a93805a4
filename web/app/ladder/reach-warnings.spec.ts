import { describe, expect, it } from 'vitest';
import type { LadderRung } from '@shared/api/ladder';
import { reachWarnings } from './reach-warnings';

const rung = (
  number: number,
  octaves: 1 | 2,
  families: LadderRung['requirements'][number]['families'] = null,
): LadderRung => ({
  number,
  title: `Rung ${number}`,
  requirements: [
    {
      code: `r${number}-c-major`,
      tonic: 'C',
      mode: 'major',
      pattern: 'cycle-broad',
      tempo: 80,
      articulation: 'tongued',
      octaves,
      optional: false,
      families,
    },
  ],
});

describe('reachWarnings', () => {
  it('should warn when a two-octave requirement targets middle-school grades', () => {
    const warnings = reachWarnings(
      [rung(1, 1), rung(2, 2)],
      [
        { grade: 7, rung: 2 },
        { grade: 10, rung: 2 },
      ],
    );
    expect(warnings.map(({ code }) => code)).toEqual(['r2-c-major']);
    expect(warnings[0].heading).toMatch(/middle school \(grade 7/);
    // Common practice, no source: two octaves of concert C take the piccolo to written C7.
    expect(
      warnings[0].details.some((line) => line.startsWith('Piccolo: Cannot fit this level')),
    ).toBe(true);
  });

  it('should say nothing when no grade is expected to reach the rung or the families can play it', () => {
    expect(reachWarnings([rung(2, 2)], [{ grade: 7, rung: 1 }])).toEqual([]);
    expect(reachWarnings([rung(1, 1, ['strings'])], [{ grade: 9, rung: 1 }])).toEqual([]);
  });
});
