import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  currentRung,
  metRequirements,
  nextRequirements,
  type PassOffRecord,
  type Requirement,
  type Rung,
} from './index';

const requirement = (id: string, tempo: number, extra: Partial<Requirement> = {}): Requirement => ({
  id,
  key: { tonic: 'Bb', mode: 'major' },
  pattern: 'long-tones',
  tempo,
  articulation: 'tongued',
  octaves: 1,
  ...extra,
});

const pass = (
  requirementId: string,
  tempo: number,
  heardOn = '2026-09-01',
  passed = true,
): PassOffRecord => ({
  requirementId,
  tempo,
  passed,
  heardOn,
});

const ladder: Rung[] = [
  {
    number: 1,
    title: 'First scales',
    requirements: [
      requirement('r1-bb', 60, { families: ['woodwind', 'brass'] }),
      requirement('r1-d', 60, { families: ['strings'] }),
      requirement('r1-chromatic', 60, { optional: true }),
    ],
  },
  {
    number: 2,
    title: 'Scales in motion',
    requirements: [requirement('r2-eb', 72), requirement('r2-f', 72)],
  },
  {
    number: 3,
    title: 'Winds only',
    requirements: [requirement('r3-ab', 80, { families: ['woodwind', 'brass'] })],
  },
  { number: 4, title: 'All twelve', requirements: [requirement('r4-c', 120)] },
];

describe('currentRung', () => {
  it('should answer 0 when nothing has been passed yet', () => {
    expect(currentRung(ladder, [], 'woodwind')).toBe(0);
  });

  it('should climb a rung when every required scale of it is passed at tempo', () => {
    expect(currentRung(ladder, [pass('r1-bb', 60)], 'woodwind')).toBe(1);
    expect(currentRung(ladder, [pass('r1-bb', 60), pass('r2-eb', 72)], 'woodwind')).toBe(1);
    expect(
      currentRung(ladder, [pass('r1-bb', 60), pass('r2-eb', 72), pass('r2-f', 80)], 'woodwind'),
    ).toBe(2);
  });

  it('should never let an optional requirement block a rung when it is unmet', () => {
    expect(currentRung(ladder, [pass('r1-bb', 60)], 'brass')).toBe(1);
    expect(metRequirements(ladder, [pass('r1-bb', 60)], 'brass').has('r1-chromatic')).toBe(false);
  });

  it('should count an optional requirement as met when it is passed', () => {
    const met = metRequirements(ladder, [pass('r1-bb', 60), pass('r1-chromatic', 66)], 'brass');
    expect([...met].sort()).toEqual(['r1-bb', 'r1-chromatic']);
  });

  it('should ask each family only for its own requirements when families are given', () => {
    expect(currentRung(ladder, [pass('r1-bb', 60)], 'strings')).toBe(0);
    expect(currentRung(ladder, [pass('r1-d', 60)], 'strings')).toBe(1);
    expect(metRequirements(ladder, [pass('r1-d', 60)], 'woodwind').size).toBe(0);
  });

  it('should pass a string player through a rung that has no string requirement', () => {
    const passes = [pass('r1-d', 60), pass('r2-eb', 72), pass('r2-f', 72)];
    expect(currentRung(ladder, passes, 'strings')).toBe(3);
    expect(currentRung(ladder, [...passes, pass('r4-c', 120)], 'strings')).toBe(4);
    const windPasses = passes.map((record) =>
      record.requirementId === 'r1-d' ? pass('r1-bb', 60) : record,
    );
    expect(currentRung(ladder, windPasses, 'woodwind')).toBe(2);
  });

  it('should climb through empty rungs at the top once every rung below is complete', () => {
    const withEmptyTop: Rung[] = [
      ...ladder,
      {
        number: 5,
        title: 'Winds showcase',
        requirements: [requirement('r5-db', 132, { families: ['woodwind'] })],
      },
    ];
    const passes = [pass('r1-d', 60), pass('r2-eb', 72), pass('r2-f', 72), pass('r4-c', 120)];
    expect(currentRung(withEmptyTop, passes, 'strings')).toBe(5);
    expect(
      currentRung(withEmptyTop, [...passes, pass('r3-ab', 80), pass('r1-bb', 60)], 'woodwind'),
    ).toBe(4);
  });

  it('should keep a pass when a later pass-off of the same scale is "not yet"', () => {
    const passes = [pass('r1-bb', 60, '2026-09-01'), pass('r1-bb', 60, '2026-10-01', false)];
    expect(currentRung(ladder, passes, 'woodwind')).toBe(1);
  });

  it('should not count a pass played slower than the requirement asks', () => {
    expect(currentRung(ladder, [pass('r1-bb', 56)], 'woodwind')).toBe(0);
    expect(
      currentRung(ladder, [pass('r1-bb', 56), pass('r1-bb', 60, '2026-09-20')], 'woodwind'),
    ).toBe(1);
  });

  it('should not count a "not yet" even at tempo', () => {
    expect(currentRung(ladder, [pass('r1-bb', 80, '2026-09-01', false)], 'woodwind')).toBe(0);
  });

  it('should drop a pass whose code a later ladder version no longer has, or whose tempo rose', () => {
    const passes = [pass('r1-bb', 60), pass('r2-eb', 72), pass('r2-f', 72)];
    expect(currentRung(ladder, passes, 'brass')).toBe(2);
    const renamed: Rung[] = ladder.map((rung) =>
      rung.number === 2
        ? { ...rung, requirements: [requirement('r2-eb-v2', 72), requirement('r2-f', 72)] }
        : rung,
    );
    expect(currentRung(renamed, passes, 'brass')).toBe(1);
    const faster: Rung[] = ladder.map((rung) =>
      rung.number === 2
        ? { ...rung, requirements: [requirement('r2-eb', 80), requirement('r2-f', 72)] }
        : rung,
    );
    expect(currentRung(faster, passes, 'brass')).toBe(1);
    expect(metRequirements(faster, passes, 'brass').has('r2-eb')).toBe(false);
  });

  it('should read the rungs in number order whatever order they come in', () => {
    const passes = [pass('r1-bb', 60), pass('r2-eb', 72), pass('r2-f', 72)];
    expect(currentRung([...ladder].reverse(), passes, 'woodwind')).toBe(2);
  });
});

describe('nextRequirements', () => {
  it('should name the unmet requirements of the lowest unfinished rung for the family', () => {
    const next = nextRequirements(ladder, [pass('r1-bb', 60), pass('r2-f', 72)], 'woodwind');
    expect(next.rung).toBe(2);
    expect(next.requirements.map((item) => item.id)).toEqual(['r2-eb']);
  });

  it('should answer no rung when the ladder is complete', () => {
    const passes = ['r1-d', 'r2-eb', 'r2-f', 'r4-c'].map((id) => pass(id, 200));
    expect(nextRequirements(ladder, passes, 'strings')).toEqual({ rung: null, requirements: [] });
  });
});

const families = ['woodwind', 'brass', 'percussion', 'strings', ''];
const codes = ['a', 'b', 'c', 'd', 'e', 'f', 'g', 'h'];

// A ladder's requirement codes are unique (the ladder editor refuses a code used twice), so a
// rung's generated requirements are unique by code; the rung's number makes them unique across.
const rungsArbitrary = fc
  .array(
    fc.uniqueArray(
      fc.record({
        id: fc.constantFrom(...codes),
        tempo: fc.integer({ min: 30, max: 240 }),
        optional: fc.boolean(),
        families: fc.option(fc.subarray(families.slice(0, 4), { minLength: 1 }), {
          nil: undefined,
        }),
      }),
      { maxLength: 4, selector: (generated) => generated.id },
    ),
    { minLength: 0, maxLength: 6 },
  )
  .map((rungs) =>
    rungs.map((requirements, index): Rung => ({
      number: index + 1,
      title: `Rung ${index + 1}`,
      requirements: requirements.map(({ id, tempo, optional, families: only }) =>
        requirement(`${id}${index}`, tempo, { optional, ...(only ? { families: only } : {}) }),
      ),
    })),
  );

const passOffArbitrary = fc.record({
  requirementId: fc.constantFrom(
    ...codes.flatMap((code) => [0, 1, 2, 3, 4, 5].map((index) => `${code}${index}`)),
  ),
  tempo: fc.integer({ min: 30, max: 240 }),
  passed: fc.boolean(),
  heardOn: fc.constantFrom('2026-09-01', '2026-10-01', '2026-11-01'),
});

/**
 * Checks a property of the rule over random ladders, pass-off histories and instrument families,
 * given the rung `currentRung` reads from them.
 */
const forEveryReading = (
  check: (rungs: Rung[], passOffs: PassOffRecord[], family: string, rung: number) => void,
) =>
  fc.assert(
    fc.property(
      rungsArbitrary,
      fc.array(passOffArbitrary, { maxLength: 40 }),
      fc.constantFrom(...families),
      (rungs, passOffs, family) =>
        check(rungs, passOffs, family, currentRung(rungs, passOffs, family)),
    ),
  );

describe('currentRung properties', () => {
  it('should never lower the rung when a passed pass-off is added', () => {
    fc.assert(
      fc.property(
        rungsArbitrary,
        fc.array(passOffArbitrary, { maxLength: 30 }),
        passOffArbitrary,
        fc.constantFrom(...families),
        (rungs, passOffs, added, family) => {
          const before = currentRung(rungs, passOffs, family);
          expect(
            currentRung(rungs, [...passOffs, { ...added, passed: true }], family),
          ).toBeGreaterThanOrEqual(before);
        },
      ),
    );
  });

  it('should never exceed the number of rungs, nor fall below 0', () => {
    forEveryReading((rungs, _passOffs, _family, rung) => {
      expect(rung).toBeGreaterThanOrEqual(0);
      expect(rung).toBeLessThanOrEqual(rungs.length);
    });
  });

  it('should not change the rung when "not yet" pass-offs are added', () => {
    fc.assert(
      fc.property(
        rungsArbitrary,
        fc.array(passOffArbitrary, { maxLength: 30 }),
        fc.array(passOffArbitrary, { maxLength: 10 }),
        fc.constantFrom(...families),
        (rungs, passOffs, notYets, family) => {
          const before = currentRung(rungs, passOffs, family);
          expect(
            currentRung(
              rungs,
              [...passOffs, ...notYets.map((record) => ({ ...record, passed: false }))],
              family,
            ),
          ).toBe(before);
        },
      ),
    );
  });

  it('should agree with a plain reading of the rule: every rung up to it is complete, the next is not', () => {
    forEveryReading((rungs, passOffs, family, rung) => {
      const complete = (number: number) =>
        rungs[number - 1]!.requirements.every(
          (item) =>
            item.optional ||
            (item.families !== undefined && !item.families.includes(family)) ||
            passOffs.some(
              (record) =>
                record.passed && record.requirementId === item.id && record.tempo >= item.tempo,
            ),
        );
      for (let number = 1; number <= rung; number += 1) expect(complete(number)).toBe(true);
      if (rung < rungs.length) expect(complete(rung + 1)).toBe(false);
    });
  });
});
