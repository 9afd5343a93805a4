import { describe, expect, it } from 'vitest';
import type { Locator, Page } from 'playwright-core';
import { overviewSchema, type Overview } from '@shared/api/analytics';
import { useBrowserApp } from '../support/browser-app';
import { chooseOption, saveScreenshot } from '../support/browser';

const e2e = useBrowserApp();

/** How long a check waits: the figures are counted on the server when the page opens. */
const patient = { timeout: 20_000 };

/** The Overview's figures as the signed-in browser's own session reads them. */
async function overviewFor(page: Page, query = ''): Promise<Overview> {
  const body = await page.evaluate(
    async (search) => (await fetch(`/api/analytics/overview${search}`)).json(),
    query,
  );
  return overviewSchema.parse(body);
}

/** The text of every cell of a table, row by row, header row first. */
async function tableTexts(table: Locator): Promise<string[][]> {
  return table.evaluate((element) =>
    Array.from(element.querySelectorAll('tr')).map((row) =>
      Array.from(row.querySelectorAll('th, td')).map((cell) => (cell.textContent ?? '').trim()),
    ),
  );
}

/** Waits until a chart card has drawn its chart (ECharts' SVG renderer draws an svg). */
async function chartDrawn(card: Locator) {
  await expect.poll(() => card.locator('svg path').count(), patient).toBeGreaterThan(3);
}

/** The bars of a chart whose fill is the given colour, as ECharts' SVG renderer writes them. */
function barsFilled(card: Locator, colour: string) {
  return card.locator(`svg path[fill="${colour}"]`);
}

describe('Overview', () => {
  it('should draw the coordinator the district charts, the same figures as tables, and drill into a bar', async () => {
    const { context, outside, page } = await e2e.signedInPage('coordinator');
    await page.waitForURL(`${e2e.app.url}/overview`);
    const byRung = page.getByTestId('chart-students-by-rung');
    await chartDrawn(byRung);
    for (const chart of [
      'chart-benchmark-by-grade',
      'chart-benchmark-by-school',
      'chart-median-rung',
      'chart-pass-offs-per-week',
    ]) {
      await chartDrawn(page.getByTestId(chart));
    }
    await page.evaluate(() => document.fonts.ready);
    await saveScreenshot(page, 'overview-coordinator-charts');

    const figures = await overviewFor(page);
    expect(figures.studentsByRung.bySchool.length).toBeGreaterThan(1);
    await expect
      .poll(() => page.getByTestId('tile-students').innerText())
      .toContain(figures.studentCount.toLocaleString('en-US'));

    // The table alternative of the stacked chart: one row per rung, one column per school.
    await byRung.getByRole('button', { name: 'Show as table' }).click();
    const table = byRung.locator('table');
    const texts = await tableTexts(table);
    expect(texts[0]).toEqual([
      'Rung',
      ...figures.studentsByRung.bySchool.map((school) => school.code),
      'All',
    ]);
    expect(texts.slice(1)).toEqual(
      figures.studentsByRung.rungs.map((rung, index) => [
        rung.rung === 0 ? 'None yet' : `Rung ${rung.rung}`,
        ...figures.studentsByRung.bySchool.map((school) => String(school.counts[index] ?? 0)),
        String(rung.students),
      ]),
    );
    expect(
      await byRung.getByRole('button', { name: 'Show as chart' }).getAttribute('aria-pressed'),
    ).toBe('true');

    // A bar of the share by school opens the students of that school below their benchmark.
    const bySchool = page.getByTestId('chart-benchmark-by-school');
    const bars = barsFilled(bySchool, '#0b6870');
    await expect.poll(() => bars.count(), patient).toBe(figures.benchmark.bySchool.length);
    await bars.first().click();
    const panel = page.getByTestId('drill-panel');
    await expect
      .poll(() => panel.locator('h2').innerText(), patient)
      .toBe(`${figures.benchmark.bySchool[0]!.name}: below the benchmark`);
    const school = figures.benchmark.bySchool[0]!;
    const below = school.students - school.atOrAbove;
    await expect
      .poll(() => panel.locator('.count').innerText(), patient)
      .toBe(`${below.toLocaleString('en-US')} ${below === 1 ? 'student' : 'students'}`);
    const schoolCodes = await panel.locator('tbody tr td:nth-child(2)').allInnerTexts();
    expect(schoolCodes.length).toBe(Math.min(below, 50));
    expect(new Set(schoolCodes)).toEqual(new Set([school.code]));
    expect(await panel.locator('tbody a').first().getAttribute('href')).toMatch(
      /^\/students\/\d+$/,
    );
    await page.keyboard.press('Escape');
    await expect.poll(() => panel.count()).toBe(0);
    expect(outside).toEqual([]);
    await context.close();
  });

  it('should show a director only the figures of their school, stacked by grade, with drills that stay in it', async () => {
    const { context, outside, page } = await e2e.signedInPage('director.hpms');
    await page.waitForURL(`${e2e.app.url}/overview`);
    const byRung = page.getByTestId('chart-students-by-rung');
    await chartDrawn(byRung);
    await expect.poll(() => byRung.locator('h2').innerText()).toBe('Students by rung, by grade');
    await expect
      .poll(() => page.getByTestId('overview-schools').innerText(), patient)
      .toContain('Heron Point Middle');
    expect(await page.getByTestId('overview-schools').innerText()).not.toContain('Quarry Hill');
    // One school: neither the school filter nor the by-school chart is offered.
    expect(await page.getByTestId('filter-school').count()).toBe(0);
    expect(await page.getByTestId('chart-benchmark-by-school').count()).toBe(0);
    await page.evaluate(() => document.fonts.ready);
    await saveScreenshot(page, 'overview-director');

    const figures = await overviewFor(page);
    expect(figures.benchmark.bySchool.map((school) => school.code)).toEqual(['HPMS']);
    await expect
      .poll(() => page.getByTestId('tile-students').innerText())
      .toContain(figures.studentCount.toLocaleString('en-US'));

    // The grade columns of the table are HPMS's grades; the tile's drill lists HPMS students only.
    await byRung.getByRole('button', { name: 'Show as table' }).click();
    const [headings] = await tableTexts(byRung.locator('table'));
    expect(headings).toEqual([
      'Rung',
      ...figures.studentsByRung.byGrade.map((grade) => `Grade ${grade.grade}`),
      'All',
    ]);
    await page.getByTestId('tile-students').getByRole('button').click();
    const panel = page.getByTestId('drill-panel');
    await expect
      .poll(() => panel.locator('.count').innerText(), patient)
      .toBe(`${figures.studentCount.toLocaleString('en-US')} students`);
    expect(new Set(await panel.locator('tbody tr td:nth-child(2)').allInnerTexts())).toEqual(
      new Set(['HPMS']),
    );
    await page.keyboard.press('Escape');

    expect(outside).toEqual([]);
    await context.close();
  });

  it('should filter the coordinator figures to one school and one grade', async () => {
    const { context, page } = await e2e.signedInPage('coordinator');
    await page.waitForURL(`${e2e.app.url}/overview`);
    await chartDrawn(page.getByTestId('chart-students-by-rung'));
    await chooseOption(page, 'filter-school', /^HPMS/);
    await page.waitForURL(/schoolId=\d+/);
    const schoolId = new URL(page.url()).searchParams.get('schoolId');
    const hpms = await overviewFor(page, `?schoolId=${schoolId}`);
    await expect
      .poll(() => page.getByTestId('tile-students').innerText(), patient)
      .toContain(hpms.studentCount.toLocaleString('en-US'));
    await expect
      .poll(() => page.getByTestId('chart-students-by-rung').locator('h2').innerText())
      .toBe('Students by rung, by grade');

    await page.getByTestId('filter-grade').click();
    await page.getByRole('option', { name: 'Grade 7' }).click();
    await page.waitForURL(/grade=7/);
    const seventh = await overviewFor(page, `?schoolId=${schoolId}&grade=7`);
    expect(seventh.studentCount).toBeLessThan(hpms.studentCount);
    await expect
      .poll(() => page.getByTestId('tile-students').innerText(), patient)
      .toContain(seventh.studentCount.toLocaleString('en-US'));
    await context.close();
  });

  it('should list the students ready for an audition on the chosen requirements', async () => {
    const { context, page } = await e2e.signedInPage('coordinator');
    await page.waitForURL(`${e2e.app.url}/overview`);
    const panel = page.getByTestId('audition-ready');
    await panel.getByRole('combobox', { name: 'Requirements' }).click();
    const options = page.getByRole('option');
    await expect.poll(() => options.count(), patient).toBeGreaterThan(2);
    const codes = [
      (await options.nth(0).innerText()).split(' · ')[0]!,
      (await options.nth(1).innerText()).split(' · ')[0]!,
    ];
    await options.nth(0).click();
    await options.nth(1).click();
    await page.keyboard.press('Escape');
    await panel.getByRole('button', { name: 'Find students' }).click();
    const ready = (await page.evaluate(
      async (query) =>
        (await fetch(`/api/analytics/audition-ready?requirementCodes=${query}&limit=200`)).json(),
      codes.join(','),
    )) as { total: number; rows: { lastName: string; firstName: string }[] };
    expect(ready.total).toBeGreaterThan(0);
    await expect
      .poll(() => panel.getByRole('status').innerText(), patient)
      .toBe(`${ready.total} ${ready.total === 1 ? 'student is' : 'students are'} ready.`);
    const names = await panel.locator('tbody th').allInnerTexts();
    expect(names.sort()).toEqual(
      ready.rows.map((row) => `${row.lastName}, ${row.firstName}`).sort(),
    );
    await context.close();
  });
});
