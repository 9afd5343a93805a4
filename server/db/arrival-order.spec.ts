import { PGlite } from '@electric-sql/pglite';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { inArrivalOrder, withArrival } from './arrival-order';

describe('inArrivalOrder', () => {
  let pglite: PGlite;
  beforeAll(async () => {
    pglite = await PGlite.create();
    inArrivalOrder(pglite);
  }, 60_000);
  afterAll(async () => {
    await pglite.close();
  });

  it('should finish the statements of an earlier request before a later request runs', async () => {
    const ran: string[] = [];
    let release!: () => void;
    const latch = new Promise<void>((resolve) => (release = resolve));
    // Something holds the engine while both requests ask for it.
    const holder = withArrival(0, () => pglite.transaction(() => latch));
    const later = withArrival(2, async () => {
      await pglite.query('select 1');
      ran.push('later');
    });
    const earlier = withArrival(1, async () => {
      for (const step of [1, 2, 3]) {
        await pglite.query('select $1::int', [step]);
        ran.push(`earlier ${step}`);
      }
    });
    // The later request asked first, but each statement of the earlier one goes ahead of it.
    release();
    await Promise.all([holder, later, earlier]);
    expect(ran).toEqual(['earlier 1', 'earlier 2', 'earlier 3', 'later']);
  });

  it('should run work outside any request in the order it asked', async () => {
    const ran: number[] = [];
    await Promise.all(
      [1, 2, 3, 4].map(async (step) => {
        await pglite.exec('select 1');
        ran.push(step);
      }),
    );
    expect(ran).toEqual([1, 2, 3, 4]);
  });
});
