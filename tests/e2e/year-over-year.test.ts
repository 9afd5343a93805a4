import { describe, expect, it } from 'vitest';
import type { Locator, Page } from 'playwright-core';
import { yearOverYearSchema, type YearOverYear } from '@shared/api/year-over-year';
import { rowsOf } from '../../server/db/client';
import { useBrowserApp } from '../support/browser-app';
import { chooseOption, saveScreenshot } from '../support/browser';

const e2e = useBrowserApp();

const patient = { timeout: 30_000 };

/** The year-over-year figures as the signed-in browser's own session reads them. */
async function figuresFor(page: Page): Promise<YearOverYear> {
  const body = await page.evaluate(async () =>
    (await fetch('/api/analytics/year-over-year')).json(),
  );
  return yearOverYearSchema.parse(body);
}

/** The text of every cell of a table, row by row, header row first. */
async function tableTexts(table: Locator): Promise<string[][]> {
  return table.evaluate((element) =>
    Array.from(element.querySelectorAll('tr')).map((row) =>
      Array.from(row.querySelectorAll('th, td')).map((cell) => (cell.textContent ?? '').trim()),
    ),
  );
}

describe('Year over year', () => {
  it('should show the coordinator retention by transition, with the names of who stopped', async () => {
    const { context, outside, page } = await e2e.signedInPage('coordinator', {
      path: '/overview',
      viewport: { width: 1360, height: 900 },
    });
    const transitions = page.getByTestId('chart-retention-by-transition');
    await transitions.scrollIntoViewIfNeeded(patient);
    // ECharts' SVG renderer draws the bars as paths.
    await expect.poll(() => transitions.locator('svg path').count(), patient).toBeGreaterThan(3);
    await expect
      .poll(() => page.getByTestId('chart-cohort-climb').locator('svg path').count(), patient)
      .toBeGreaterThan(3);
    const figures = await figuresFor(page);
    const total = figures.retention.total;
    await expect
      .poll(() => page.getByTestId('retention-total').innerText(), patient)
      .toContain(`Of ${total.players.toLocaleString('en-US')} students who played in 2025-26`);
    await page.evaluate(() => document.fonts.ready);
    await page.getByRole('heading', { name: 'Year over year' }).scrollIntoViewIfNeeded();
    await page.waitForTimeout(500);
    await saveScreenshot(page, 'overview-retention');

    // The table alternative: one row per transition, with the counts the server gave.
    await transitions.getByRole('button', { name: 'Show as table' }).click();
    const texts = await tableTexts(transitions.locator('table'));
    expect(texts[0]).toEqual(['Transition', 'Played 2025-26', 'Still play', 'Stopped', 'Share']);
    expect(texts.slice(1).map((row) => row.slice(1, 4))).toEqual(
      figures.retention.byTransition.map((step) => [
        String(step.players),
        String(step.continued),
        String(step.players - step.continued),
      ]),
    );
    // Grade 5 into the middle schools: the stopped count opens their names.
    const grade5 = figures.retention.byTransition.find((step) => step.fromGrade === 5)!;
    await transitions
      .locator('tr', { hasText: 'Grade 5 to grade 6' })
      .getByRole('button', { name: /stopped after 2025-26/ })
      .click();
    const panel = page.getByTestId('drill-panel');
    await expect
      .poll(() => panel.locator('h2').innerText(), patient)
      .toContain('Grade 5 to grade 6');
    await expect
      .poll(() => panel.locator('.count').innerText(), patient)
      .toBe(`${grade5.players - grade5.continued} students`);
    expect(await panel.locator('tbody tr').first().innerText()).toContain('Stopped');
    await saveScreenshot(page, 'overview-retention-names');
    expect(outside).toEqual([]);
    await context.close();
  }, 120_000);

  it('should show rung by grade against last year at the same day, as a chart and as a table', async () => {
    const { context, outside, page } = await e2e.signedInPage('coordinator', {
      path: '/overview',
      viewport: { width: 1360, height: 900 },
    });
    const card = page.getByTestId('chart-rung-by-grade-years');
    await card.scrollIntoViewIfNeeded(patient);
    // Two bars a grade, drawn as SVG paths by ECharts' SVG renderer.
    const figures = await figuresFor(page);
    const grades = figures.rungByGrade.grades;
    expect(grades.length).toBeGreaterThan(3);
    await expect
      .poll(() => card.locator('svg path').count(), patient)
      .toBeGreaterThan(grades.length);
    await page.evaluate(() => document.fonts.ready);
    await page.waitForTimeout(500);
    await card.scrollIntoViewIfNeeded();
    await saveScreenshot(page, 'overview-rung-by-grade-years');

    // The table alternative: one row a grade, with the medians and counts the server gave.
    await card.getByRole('button', { name: 'Show as table' }).click();
    const texts = await tableTexts(card.locator('table'));
    expect(texts[0]![0]).toBe('Grade');
    expect(texts[0]![1]).toContain('2025-26');
    expect(texts[0]![3]).toContain('2026-27');
    const rung = (median: number | null) =>
      median === null ? '—' : Number.isInteger(median) ? String(median) : median.toFixed(1);
    expect(texts.slice(1)).toEqual(
      grades.map((grade) => [
        grade.grade === 0 ? 'Kindergarten' : `Grade ${grade.grade}`,
        rung(grade.previous.median),
        String(grade.previous.students),
        rung(grade.current.median),
        String(grade.current.students),
      ]),
    );
    await card.scrollIntoViewIfNeeded();
    await saveScreenshot(page, 'overview-rung-by-grade-years-table');
    // This year's count of a grade opens the grade's students.
    const grade8 = grades.find((grade) => grade.grade === 8)!;
    await card
      .locator('tr', { hasText: 'Grade 8' })
      .getByRole('button', { name: /Grade 8: every student/ })
      .click();
    const panel = page.getByTestId('drill-panel');
    await expect.poll(() => panel.locator('h2').innerText(), patient).toContain('Grade 8');
    await expect
      .poll(() => panel.locator('.count').innerText(), patient)
      .toBe(`${grade8.current.students} students`);
    expect(outside).toEqual([]);
    await context.close();
  }, 120_000);

  it('should show a director a past year’s pass-offs, read-only', async () => {
    const { context, outside, page } = await e2e.signedInPage('director.hpms', {
      path: '/pass-offs',
    });
    await page.getByTestId('choose-ensemble').waitFor(patient);
    await chooseOption(page, 'filter-year', '2025-26');
    await page.getByTestId('past-year-note').waitFor(patient);
    // No entry grid for a past year: only the list of what was heard.
    expect(await page.getByTestId('choose-ensemble').count()).toBe(0);
    const [{ heard }] = rowsOf<{ heard: number }>(
      await e2e.app.database.db.execute(
        // A director reads the pass-offs of the students now at their schools, whenever heard.
        `select count(*)::int as heard from pass_offs p join students st on st.id = p.student_id
         join schools s on s.id = st.school_id
         where s.code = 'HPMS' and p.heard_on between '2025-08-18' and '2026-06-12'` as never,
      ),
    );
    expect(heard).toBeGreaterThan(0);
    const gridCount = async () =>
      Number((await page.getByTestId('grid-count').innerText()).replace(/[^\d]/g, ''));
    await expect.poll(gridCount, patient).toBe(heard);
    const firstDayCell = page.locator(
      '[role=row][row-index="0"] [role=gridcell][col-id="heardOn"]',
    );
    await firstDayCell.waitFor();
    // The rows are drawn a moment after the count: read the first day until it has settled.
    await expect
      .poll(async () => {
        const firstDay = await firstDayCell.innerText();
        return firstDay >= '2025-08-18' && firstDay <= '2026-06-12' ? 'in 2025-26' : firstDay;
      }, patient)
      .toBe('in 2025-26');
    await saveScreenshot(page, 'pass-offs-past-year');
    expect(outside).toEqual([]);
    await context.close();
  }, 120_000);
});
