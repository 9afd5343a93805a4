import fs from 'node:fs';
import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { demoEmail } from '../support/test-app';
import { useBrowserApp } from '../support/browser-app';
import { localOnlyContext, saveScreenshot, signInAs } from '../support/browser';
import { gridCsv } from '../../web/app/core/grid/grid-csv';
import { columnCsv } from '../../web/app/core/grid/column-csv';
import { columnStateOf, layoutOf } from '../../web/app/core/grid/grid-layout';
import { listParameters, sortParameter } from '../../web/app/core/grid/grid-query';

const e2e = useBrowserApp();

/** One cell of the grid's data rows (header rows carry no row-index). */
function cell(page: Page, index: number, colId: string) {
  return page.locator(`[role=row][row-index="${index}"] [role=gridcell][col-id="${colId}"]`);
}

async function cellText(page: Page, index: number, colId: string): Promise<string> {
  return (await cell(page, index, colId).innerText()).trim();
}

function header(page: Page, colId: string) {
  return page.locator(`[role=columnheader][col-id="${colId}"]`);
}

/** The texts of one column in the first rows the grid has rendered. */
async function columnTexts(page: Page, colId: string, rows: number): Promise<string[]> {
  const texts: string[] = [];
  for (let index = 0; index < rows; index++) texts.push(await cellText(page, index, colId));
  return texts;
}

async function gridCount(page: Page): Promise<number> {
  const text = await page.getByTestId('grid-count').innerText();
  return Number(text.replace(/[^\d]/g, ''));
}

/** How long a check waits for the grid: pages come from the server as the grid asks. */
const patient = { timeout: 15_000 };

const gradeNumber = (label: string) => (label === 'K' ? 0 : Number(label));

describe('Students grid', () => {
  it('should show a director only the students of their school, searchable and sorted by grade', async () => {
    const { context, outside } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('director.hpms'), '/students');
    await page.waitForURL(`${e2e.app.url}/students`);
    await expect
      .poll(() => page.getByTestId('grid-count').innerText(), patient)
      .toMatch(/^[\d,]+ students$/);

    const client = await e2e.app.signIn(demoEmail('director.hpms'));
    const all = await client.get('/api/students?status=active&limit=1');
    expect(await gridCount(page)).toBe(all.body.total);
    // The count arrives with the first page; the rows' cells fill in a frame later.
    await expect
      .poll(async () => [...new Set(await columnTexts(page, 'school', 10))], patient)
      .toEqual(['HPMS']);
    // A director has one school, so the screen offers no school filter.
    expect(await page.getByTestId('filter-school').count()).toBe(0);

    const lastName = await cellText(page, 0, 'lastName');
    await page.getByTestId('student-search').fill(lastName);
    await expect.poll(() => gridCount(page), patient).toBeLessThan(all.body.total);
    await expect.poll(() => cellText(page, 0, 'lastName'), patient).toBe(lastName);
    const found = await gridCount(page);
    for (const name of await columnTexts(page, 'lastName', Math.min(found, 5)))
      expect(name).toBe(lastName);

    await page.getByTestId('student-search').fill('');
    await expect.poll(() => gridCount(page), patient).toBe(all.body.total);
    await header(page, 'grade').click();
    await expect
      .poll(() => header(page, 'grade').getAttribute('aria-sort'), patient)
      .toBe('ascending');
    const lowest = await client.get('/api/students?status=active&sort=grade:asc&limit=1');
    await expect
      .poll(() => cellText(page, 0, 'grade'), patient)
      .toBe(lowest.body.rows[0].gradeLabel);
    const ascending = (await columnTexts(page, 'grade', 8)).map(gradeNumber);
    expect(ascending).toEqual([...ascending].sort((a, b) => a - b));

    await header(page, 'grade').click();
    const highest = await client.get('/api/students?status=active&sort=grade:desc&limit=1');
    await expect
      .poll(() => cellText(page, 0, 'grade'), patient)
      .toBe(highest.body.rows[0].gradeLabel);
    const descending = (await columnTexts(page, 'grade', 8)).map(gradeNumber);
    expect(descending).toEqual([...descending].sort((a, b) => b - a));
    expect(descending[0]).toBeGreaterThan(ascending[0]!);

    await header(page, 'lastName').click();
    await expect
      .poll(() => header(page, 'lastName').getAttribute('aria-sort'), patient)
      .toBe('ascending');
    expect(await header(page, 'grade').getAttribute('aria-sort')).toBe('none');
    await expect.poll(() => cellText(page, 0, 'lastName'), patient).toBe(lastName);
    await saveScreenshot(page, 'students-grid');
    expect(outside).toEqual([]);
    await context.close();
  });

  it('should fetch the next block of students by cursor as the coordinator scrolls down', async () => {
    const { context } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    const asked: URL[] = [];
    page.on('request', (request) => {
      const url = new URL(request.url());
      if (url.pathname === '/api/students') asked.push(url);
    });
    await signInAs(page, e2e.app.url, demoEmail('coordinator'), '/students');
    await expect
      .poll(() => page.getByTestId('grid-count').innerText(), patient)
      .toMatch(/^[\d,]+ students$/);
    await expect.poll(() => cellText(page, 0, 'lastName'), patient).not.toBe('');
    // Scrolling past row 100 makes the grid ask for its second block.
    await cell(page, 0, 'lastName').hover();
    const secondBlock = () => asked.find((url) => url.searchParams.get('offset') === '100');
    for (const deadline = Date.now() + 20_000; !secondBlock() && Date.now() < deadline;) {
      await page.mouse.wheel(0, 800);
      await page.waitForTimeout(250);
    }
    await expect.poll(() => secondBlock()?.searchParams.get('after'), patient).toBeTruthy();
    // A row the grid drew from the second block on, against the same row asked for by offset.
    const drawnPast100 = async () =>
      (
        await page
          .locator('[role=row][row-index]')
          .evaluateAll((rows) => rows.map((row) => Number(row.getAttribute('row-index'))))
      )
        .filter((index) => index >= 100)
        .sort((first, second) => first - second)[0];
    await expect.poll(drawnPast100, patient).toBeDefined();
    const index = (await drawnPast100())!;
    const client = await e2e.app.signIn(demoEmail('coordinator'));
    const same = await client.get(`/api/students?status=active&offset=${index}&limit=1`);
    await expect
      .poll(() => cellText(page, index, 'studentNumber'), patient)
      .toBe(same.body.rows[0].studentNumber);
    await context.close();
  });

  it('should keep a changed preferred name after a reload of the student record', async () => {
    const { context, outside } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('director.hpms'), '/students');
    await expect.poll(() => cellText(page, 0, 'lastName'), patient).not.toBe('');
    const lastName = await cellText(page, 0, 'lastName');
    await cell(page, 0, 'lastName').click();
    await page.waitForURL(/\/students\/\d+\/edit$/);
    const studentId = /\/students\/(\d+)\/edit$/.exec(page.url())![1];
    await expect
      .poll(() => page.getByTestId('student-name').innerText(), patient)
      .toContain(lastName);
    expect(await page.getByRole('note').innerText()).toContain('Student records are personal data');
    expect(await page.getByTestId('student-progress').getAttribute('href')).toBe(
      `/students/${studentId}`,
    );

    await page.getByTestId('preferred-name').fill('Wren');
    await page.getByTestId('save-student').click();
    await expect.poll(() => page.getByText('Saved.').count(), patient).toBe(1);
    await page.reload();
    await expect.poll(() => page.getByTestId('preferred-name').inputValue(), patient).toBe('Wren');
    await expect
      .poll(() => page.getByTestId('student-name').innerText(), patient)
      .toBe(`Wren ${lastName}`);
    await page.evaluate(() => document.fonts.ready);
    await saveScreenshot(page, 'student-edit');

    const client = await e2e.app.signIn(demoEmail('director.hpms'));
    expect((await client.get(`/api/students/${studentId}`)).body.preferredName).toBe('Wren');
    expect(outside).toEqual([]);
    await context.close();
  });

  it('should not let a director open a student of another school', async () => {
    const coordinator = await e2e.app.signIn(demoEmail('coordinator'));
    const quarryHill = await coordinator.get('/api/schools?code=QHMS');
    const other = await coordinator.get(
      `/api/students?schoolId=${quarryHill.body.rows[0].id}&limit=1`,
    );
    const { context } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(
      page,
      e2e.app.url,
      demoEmail('director.hpms'),
      `/students/${other.body.rows[0].id}/edit`,
    );
    await expect
      .poll(() => page.getByRole('alert').innerText(), patient)
      .toContain('The student could not be opened');
    expect(await page.getByTestId('student-form').count()).toBe(0);
    await context.close();
  });
});

describe('Schools and ensembles grids', () => {
  it('should show the coordinator every school and export the view as CSV', async () => {
    const { context, outside } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('coordinator'), '/schools');
    await expect
      .poll(() => page.getByTestId('grid-count').innerText(), patient)
      .toMatch(/^\d+ schools$/);
    const client = await e2e.app.signIn(demoEmail('coordinator'));
    const schools = await client.get('/api/schools?sort=name:asc&limit=100');
    expect(await gridCount(page)).toBe(schools.body.total);
    await expect
      .poll(() => columnTexts(page, 'name', 3), patient)
      .toEqual(schools.body.rows.slice(0, 3).map((school: { name: string }) => school.name));
    await page.evaluate(() => document.fonts.ready);
    await saveScreenshot(page, 'schools-grid');

    const [download] = await Promise.all([
      page.waitForEvent('download'),
      page.getByTestId('grid-export').click(),
    ]);
    expect(download.suggestedFilename()).toMatch(/^schools-\d{4}-\d{2}-\d{2}\.csv$/);
    const csv = fs.readFileSync((await download.path())!, 'utf8').replace(/^\uFEFF/, '');
    const lines = csv.split('\r\n');
    expect(lines[0]).toBe('Code,School,Level,Grades,Students move up to,Status,Students,Ensembles');
    expect(lines).toHaveLength(schools.body.total + 2);
    expect(lines[1]!.split(',')[1]).toBe(schools.body.rows[0].name);
    await expect
      .poll(() => page.getByTestId('grid-export-status').innerText(), patient)
      .toContain('Exported');
    expect(outside).toEqual([]);
    await context.close();
  });

  it('should open a school with its ensembles, and let the coordinator open the ensembles grid', async () => {
    const { context, outside } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('coordinator'), '/ensembles');
    await expect
      .poll(() => page.getByTestId('grid-count').innerText(), patient)
      .toMatch(/^\d+ ensembles$/);
    const client = await e2e.app.signIn(demoEmail('coordinator'));
    const ensembles = await client.get('/api/ensembles?limit=1');
    expect(await gridCount(page)).toBe(ensembles.body.total);

    await page.getByTestId('filter-kind').click();
    await page.getByRole('option', { name: 'Concert band' }).click();
    const concertBands = await client.get('/api/ensembles?kind=concert-band&limit=100');
    expect(concertBands.body.total).toBeGreaterThan(0);
    await expect.poll(() => gridCount(page), patient).toBe(concertBands.body.total);
    for (const kind of await columnTexts(page, 'kind', concertBands.body.total)) {
      expect(kind).toBe('Concert band');
    }
    await saveScreenshot(page, 'ensembles-grid');

    const heronPoint = (await client.get('/api/schools?code=HPMS')).body.rows[0];
    await page.goto(`${e2e.app.url}/schools/${heronPoint.id}`);
    await expect.poll(() => page.locator('h1').innerText(), patient).toBe('Heron Point Middle');
    const schoolEnsembles = await client.get(`/api/ensembles?schoolId=${heronPoint.id}&limit=100`);
    await expect
      .poll(() => page.getByTestId('school-ensembles').locator('li').count(), patient)
      .toBe(schoolEnsembles.body.total);
    await saveScreenshot(page, 'school-detail');
    expect(outside).toEqual([]);
    await context.close();
  });

  it('should remember a hidden column for the next visit', async () => {
    const { context } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('director.qhms'), '/schools');
    await expect.poll(() => page.getByTestId('grid-count').innerText(), patient).toBe('1 school');
    await expect.poll(() => header(page, 'level').count(), patient).toBe(1);
    await page.getByTestId('grid-columns').click();
    await page.getByRole('menuitemcheckbox', { name: 'Level' }).click();
    await expect
      .poll(
        () => page.getByRole('menuitemcheckbox', { name: 'Level' }).getAttribute('aria-checked'),
        patient,
      )
      .toBe('false');
    await page.keyboard.press('Escape');
    await expect.poll(() => header(page, 'level').count(), patient).toBe(0);
    const client = await e2e.app.signIn(demoEmail('director.qhms'));
    await expect
      .poll(
        async () => (await client.get('/api/grid-preferences/schools')).body.state?.columns ?? [],
        patient,
      )
      .toContainEqual(expect.objectContaining({ colId: 'level', hide: true }));
    await page.reload();
    await expect.poll(() => page.getByTestId('grid-count').innerText(), patient).toMatch(/school/);
    expect(await header(page, 'level').count()).toBe(0);
    expect(await header(page, 'name').count()).toBe(1);
    await context.close();
  });
});

describe('gridCsv', () => {
  const columns = [
    columnCsv<{ id: number; lastName: string; grade: number; gradeLabel: string }>({
      field: 'lastName',
      headerName: 'Last name',
    }),
    columnCsv<{ id: number; lastName: string; grade: number; gradeLabel: string }>({
      field: 'grade',
      headerName: 'Grade',
      valueFormatter: ({ data }) => data?.gradeLabel ?? '',
    }),
  ];

  it('should write the visible headers and the cells the screen shows when exporting rows', () => {
    const csv = gridCsv(columns, [{ id: 1, lastName: 'Okafor', grade: 0, gradeLabel: 'K' }]);
    expect(csv).toBe('Last name,Grade\r\nOkafor,K\r\n');
  });

  it('should neutralise a cell that starts with a formula character when exporting', () => {
    // OWASP "CSV Injection": cells starting with = + - @ tab or carriage return are prefixed with '.
    const csv = gridCsv(columns, [
      { id: 1, lastName: '=HYPERLINK("http://example.invalid")', grade: 7, gradeLabel: '7' },
      { id: 2, lastName: '@SUM(A1)', grade: 8, gradeLabel: '8' },
    ]);
    const [, first, second] = csv.split('\r\n');
    // RFC 4180 section 2: a field with a double quote is quoted and its quotes doubled.
    expect(first).toBe(`"'=HYPERLINK(""http://example.invalid"")",7`);
    expect(second).toBe(`'@SUM(A1),8`);
  });

  it('should quote a cell that holds a comma or a line break when exporting', () => {
    const csv = gridCsv(columns, [
      { id: 1, lastName: 'Vance, Jr.\nII', grade: 9, gradeLabel: '9' },
    ]);
    // RFC 4180 section 2: fields containing commas or line breaks are enclosed in double quotes.
    expect(csv.split('\r\n')[1]).toBe('"Vance, Jr.\nII",9');
  });
});

describe('listParameters', () => {
  it('should send the search, sort, page and only the filters that are set when asking for a page', () => {
    const parameters = listParameters({
      quickSearch: '  Okafor ',
      sort: sortParameter([{ colId: 'grade', sort: 'desc' }]),
      filters: { schoolId: 3, grade: 0, status: null, instrumentId: '' },
      offset: 200,
      limit: 100,
    });
    expect(parameters).toEqual({
      q: 'Okafor',
      sort: 'grade:desc',
      schoolId: '3',
      grade: '0',
      offset: '200',
      limit: '100',
    });
  });

  it('should leave the sort to the server when the grid has none', () => {
    expect(sortParameter([])).toBeUndefined();
  });
});

describe('columnStateOf', () => {
  it('should drop columns the screen no longer has and sort only by a sortable one when restoring', () => {
    const layout = {
      columns: [
        { colId: 'grade', width: 90, hide: false },
        { colId: 'retired', width: 120, hide: false },
        { colId: 'ensembles', hide: true },
      ],
      sort: 'ensembles:desc',
    };
    const state = columnStateOf(layout, new Set(['grade', 'ensembles']), new Set(['grade']));
    expect(state.map((column) => column.colId)).toEqual(['grade', 'ensembles']);
    expect(state.every((column) => column.sort === null)).toBe(true);
    expect(state[1]!.hide).toBe(true);
    const sorted = columnStateOf(
      { ...layout, sort: 'grade:desc' },
      new Set(['grade']),
      new Set(['grade']),
    );
    expect(sorted).toEqual([
      { colId: 'grade', width: 90, hide: false, pinned: null, sort: 'desc' },
    ]);
  });

  it('should read back the layout it wrote when a layout is saved and restored', () => {
    const layout = layoutOf([
      { colId: 'lastName', width: 140.4, hide: false, pinned: null, sort: 'asc' },
      { colId: 'status', width: 100, hide: true, pinned: null, sort: null },
    ]);
    expect(layout).toEqual({
      columns: [
        { colId: 'lastName', width: 140, hide: false, pinned: null },
        { colId: 'status', width: 100, hide: true, pinned: null },
      ],
      sort: 'lastName:asc',
    });
    const known = new Set(['lastName', 'status']);
    expect(layoutOf(columnStateOf(layout, known, known))).toEqual(layout);
  });
});
