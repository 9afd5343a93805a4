import { describe, expect, it } from 'vitest';
import type { PassOffRecord, Requirement, Rung } from '@shared/ladder/index';
import { rungDates } from './attainment';

const requirement = (id: string, extra: Partial<Requirement> = {}): Requirement => ({
  id,
  key: { tonic: 'C', mode: 'major' },
  pattern: 'long-tones',
  tempo: 80,
  articulation: 'tongued',
  octaves: 1,
  ...extra,
});
const met = (requirementId: string, heardOn: string): PassOffRecord => ({
  requirementId,
  tempo: 80,
  passed: true,
  heardOn,
});

// An invented three-rung ladder; the expected days are worked out by hand from the rule that a
// rung is reached when every non-optional requirement of it and of the rungs below is met.
const ladder: Rung[] = [
  { number: 1, title: 'One', requirements: [requirement('a'), requirement('b')] },
  {
    number: 2,
    title: 'Two',
    requirements: [requirement('c'), requirement('stretch', { optional: true })],
  },
  { number: 3, title: 'Three', requirements: [requirement('d', { families: ['strings'] })] },
];

describe('rungDates', () => {
  it('should give the day each rung was reached when its last requirement was met', () => {
    expect(
      rungDates(
        ladder,
        [met('a', '2026-09-01'), met('b', '2026-09-10'), met('c', '2026-10-02')],
        'strings',
      ),
    ).toEqual(['2026-09-10', '2026-10-02']);
  });

  it('should give one day twice when a late requirement completes two rungs at once', () => {
    // c met before b: rung 1 and rung 2 are both reached the day b is met.
    expect(
      rungDates(
        ladder,
        [met('a', '2026-09-01'), met('c', '2026-09-05'), met('b', '2026-11-20')],
        'strings',
      ),
    ).toEqual(['2026-11-20', '2026-11-20']);
  });

  it('should pass through a rung with nothing for the family, and ignore optional ones', () => {
    // Rung 3 asks only strings: a brass player reaches it with rung 2.
    expect(
      rungDates(
        ladder,
        [met('a', '2026-09-01'), met('b', '2026-09-01'), met('c', '2026-12-01')],
        'brass',
      ),
    ).toEqual(['2026-09-01', '2026-12-01', '2026-12-01']);
    expect(rungDates(ladder, [met('stretch', '2026-09-01')], 'brass')).toEqual([]);
  });
});
