import { describe, expect, it } from 'vitest';
import { rowsOf } from '../../server/db/client';
import { demoEmail } from '../support/test-app';
import { useBrowserApp } from '../support/browser-app';
import { localOnlyContext, saveScreenshot, signInAs } from '../support/browser';

const e2e = useBrowserApp();

describe('School years screen', () => {
  it('should let the coordinator preview and start 2027-28 on the demo, with a backup offered first', async () => {
    const { context, outside } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('coordinator'), '/school-years');
    await page.waitForURL(`${e2e.app.url}/school-years`);
    await expect.poll(() => page.locator('h1').innerText()).toBe('School years');
    const table = page.getByTestId('year-table');
    await expect.poll(() => table.innerText()).toContain('2026-27');
    expect(await table.locator('tr[data-year="2026-27"]').innerText()).toContain('Current');
    // The next year's name and dates are suggested from the current one.
    expect(await page.getByTestId('start-name').inputValue()).toBe('2027-28');
    expect(await page.getByTestId('start-starts').inputValue()).toBe('2027-08-16');

    await page.getByTestId('start-preview').click();
    const panel = page.getByTestId('start-preview-panel');
    await panel.waitFor();
    const [{ active }] = rowsOf<{ active: number }>(
      await e2e.app.database.db.execute(
        `select count(*)::int as active from students where status = 'active'` as never,
      ),
    );
    await expect
      .poll(() => panel.locator('.totals').innerText())
      .toContain(active!.toLocaleString('en-US'));
    expect(await panel.innerText()).toContain('Heron Point Middle');
    expect(await page.getByTestId('download-backup').getAttribute('href')).toBe('/api/backup');
    await saveScreenshot(page, 'school-years-preview');

    await page.getByTestId('start-year').click();
    await page.getByTestId('start-confirm').click();
    const result = page.getByTestId('start-result');
    await result.waitFor({ timeout: 60_000 });
    expect(await result.innerText()).toContain('2027-28 has started');
    await expect
      .poll(() => table.locator('tr[data-year="2027-28"]').innerText())
      .toContain('Current');
    expect(await table.locator('tr[data-year="2026-27"]').innerText()).toContain('History');
    await saveScreenshot(page, 'school-years-started');
    const [year] = rowsOf<{ name: string }>(
      await e2e.app.database.db.execute(`select name from school_years where current` as never),
    );
    expect(year!.name).toBe('2027-28');

    // A student who moved up: their record lists the year just ended.
    const [movedUp] = rowsOf<{ id: number; year: string }>(
      await e2e.app.database.db.execute(
        `select sy.student_id as id from student_years sy join school_years y on y.id = sy.school_year_id
         where y.name = '2026-27' and sy.outcome = 'moving-up' order by sy.student_id limit 1` as never,
      ),
    );
    await page.goto(`${e2e.app.url}/students/${movedUp!.id}/edit`);
    const years = page.getByTestId('student-years');
    await years.waitFor({ timeout: 30_000 });
    expect(await years.innerText()).toContain('2026-27');
    expect(await years.innerText()).toContain('Moved up');
    await saveScreenshot(page, 'student-past-years');

    // The students grid of the year just ended: that year's schools and grades, read-only.
    await page.goto(`${e2e.app.url}/students`);
    await page.getByTestId('filter-year').click();
    await page.getByRole('option', { name: '2026-27', exact: true }).click();
    await page.getByTestId('past-year-note').waitFor();
    expect(await page.getByRole('link', { name: 'Add student' }).count()).toBe(0);
    const [{ kept }] = rowsOf<{ kept: number }>(
      await e2e.app.database.db.execute(
        `select count(*)::int as kept from student_years sy join school_years y on y.id = sy.school_year_id where y.name = '2026-27'` as never,
      ),
    );
    // The grid's row count is the year's students, from the history the start recorded.
    const gridCount = async () =>
      Number((await page.getByTestId('grid-count').innerText()).replace(/[^\d]/g, ''));
    await expect.poll(gridCount, { timeout: 30_000 }).toBe(kept);
    await page.locator('[role=row][row-index="0"] [role=gridcell][col-id="school"]').waitFor();
    await saveScreenshot(page, 'students-past-year');
    expect(outside).toEqual([]);
    await context.close();
  }, 180_000);
});
