import { describe, expect, it } from 'vitest';
import { firstValueFrom, of, timer, map } from 'rxjs';
import { allPages } from './all-pages';

/** A server's list of `total` numbered rows, paged by offset, each page answered after `delay(offset)` ms. */
function pagedList(total: number, pageSize: number, delay: (offset: number) => number) {
  const asked: number[] = [];
  let open = 0;
  let mostOpen = 0;
  const page = (offset: number) => {
    asked.push(offset);
    open += 1;
    mostOpen = Math.max(mostOpen, open);
    const rows = Array.from(
      { length: Math.max(0, Math.min(pageSize, total - offset)) },
      (_, i) => offset + i,
    );
    return timer(delay(offset)).pipe(
      map(() => {
        open -= 1;
        return { rows, total };
      }),
    );
  };
  return { page, asked, mostOpen: () => mostOpen };
}

describe('allPages', () => {
  it('should join every page in order even when later pages answer first', async () => {
    // The last page answers first: the rows must still come out in the list's order.
    const list = pagedList(2_345, 1_000, (offset) => (offset === 0 ? 5 : 40 - offset / 100));
    const rows = await firstValueFrom(allPages(list.page, 1_000));
    expect(rows).toEqual(Array.from({ length: 2_345 }, (_, i) => i));
    expect(list.asked).toEqual([0, 1_000, 2_000]);
    // The pages after the first were in flight together.
    expect(list.mostOpen()).toBe(2);
  });

  it('should ask once when the first page holds the whole list, or the list is empty', async () => {
    const short = pagedList(999, 1_000, () => 1);
    expect(await firstValueFrom(allPages(short.page, 1_000))).toHaveLength(999);
    expect(short.asked).toEqual([0]);
    const exact = pagedList(1_000, 1_000, () => 1);
    expect(await firstValueFrom(allPages(exact.page, 1_000))).toHaveLength(1_000);
    expect(exact.asked).toEqual([0]);
    expect(await firstValueFrom(allPages(() => of({ rows: [], total: 0 }), 1_000))).toEqual([]);
  });
});
