import { describe, expect, it } from 'vitest';
import { demoEmail } from '../support/test-app';
import type { Student } from '@shared/api/student';
import { dialogReady, saveScreenshot, signInAs } from '../support/browser';
import {
  dialogBox,
  seriousViolations,
  sidewaysOverflow,
  touchContext,
  useSmallScreens,
} from './small-screens-app';

const started = useSmallScreens();

describe('Phones and tablets', () => {
  it('should show the rest of a grid row in a sheet on a phone, open the row from it, and show a dialog full-screen', async () => {
    const { app, browser } = started;
    const context = await touchContext(browser, { width: 390, height: 844 }, 2);
    const page = await context.newPage();
    await signInAs(page, app.url, demoEmail('director.hpms'));
    await page.goto(`${app.url}/students`);
    const firstRow = page.locator('.ag-row[row-index="0"]').first();
    await firstRow.locator('.ag-cell').first().waitFor({ timeout: 30_000 });
    // The phone keeps the key columns the screen marks: last name, first name, grade.
    const headings = await page
      .locator('.ag-header-cell:not(.ag-hidden) .ag-header-cell-text')
      .allInnerTexts();
    expect(headings).toEqual(['Last name', 'First name', 'Grade']);
    // A row's cells are placed before their values are drawn: wait for the names.
    await expect
      .poll(async () => (await firstRow.locator('.ag-cell').allInnerTexts()).slice(0, 2), {
        timeout: 10_000,
      })
      .not.toContain('');
    const shown = await firstRow.locator('.ag-cell').allInnerTexts();

    await firstRow.locator('.ag-cell').first().tap();
    const sheet = page.locator('mat-bottom-sheet-container');
    await sheet.getByTestId('row-detail-title').waitFor({ timeout: 10_000 });
    const labels = await sheet.locator('dt').allInnerTexts();
    expect(labels).toEqual([
      'Student ID',
      'Preferred',
      'School',
      'Ensembles',
      'Instruments',
      'Status',
    ]);
    const values = await sheet.locator('dd').allInnerTexts();
    const studentNumber = values[0]!;
    // The row the sheet reads out is the student the API has under that number, with the same
    // names the grid's row shows and the school the API gives.
    const director = await app.signIn(demoEmail('director.hpms'));
    const found = (
      await director.get(`/api/students?q=${encodeURIComponent(studentNumber)}&limit=10`)
    ).body.rows as Student[];
    const student = found.find((row) => row.studentNumber === studentNumber);
    expect(student, `student ${studentNumber}`).toBeDefined();
    expect(shown.slice(0, 2)).toEqual([student!.lastName, student!.firstName]);
    expect(await sheet.getByTestId('row-detail-title').innerText()).toBe(
      shown.filter((text) => text.trim() !== '').join(' · '),
    );
    expect(values[2]).toBe(student!.schoolCode);
    const sheetBox = await sheet.boundingBox();
    expect(sheetBox!.width).toBeGreaterThanOrEqual(389);
    expect((await seriousViolations(page)).join('\n')).toBe('');
    await saveScreenshot(page, 'phone-students-row-detail');

    // From the sheet to the student's own page.
    await sheet.getByTestId('row-detail-open').tap();
    await page.waitForURL(new RegExp(`/students/${student!.id}(/|$)`), { timeout: 20_000 });
    await page.locator('main h1').first().waitFor({ timeout: 30_000 });
    await context.clearCookies();

    // A form in a dialog fills the phone (Material Design 3: full-screen dialogs on compact
    // windows): the check-out dialog of the loans screen.
    await signInAs(page, app.url, demoEmail('coordinator'), '/loans');
    await page.getByTestId('check-out').tap();
    await dialogReady(page);
    await expect.poll(() => dialogBox(page)).toEqual({ x: 0, y: 0, width: 390, height: 844 });
    expect((await sidewaysOverflow(page)).overflow).toBeLessThanOrEqual(0);
    await saveScreenshot(page, 'phone-dialog-check-out');
    await context.close();

    // A tablet held upright (a medium window): the columns that fit its width, no sideways
    // scroll inside the grid, and the rest of a row in the same sheet.
    const tablet = await touchContext(browser, { width: 820, height: 1180 });
    const tabletPage = await tablet.newPage();
    await signInAs(tabletPage, app.url, demoEmail('coordinator'), '/ensembles');
    const tabletRow = tabletPage.locator('.ag-row[row-index="0"]').first();
    await tabletRow.locator('.ag-cell').first().waitFor({ timeout: 30_000 });
    const allHeadings = ['Ensemble', 'School', 'Kind', 'Level', 'Director', 'Meets', 'Members'];
    const tabletHeadings = await tabletPage
      .locator('.ag-header-cell .ag-header-cell-text')
      .allInnerTexts();
    expect(tabletHeadings.length).toBeGreaterThan(3);
    expect(tabletHeadings.length).toBeLessThan(allHeadings.length);
    expect(tabletHeadings).toEqual(allHeadings.slice(0, tabletHeadings.length));
    const frame = await tabletPage.locator('tb-server-grid section.frame').boundingBox();
    const lastHeading = await tabletPage.locator('.ag-header-cell').last().boundingBox();
    expect(lastHeading!.x + lastHeading!.width).toBeLessThanOrEqual(frame!.x + frame!.width + 1);
    await tabletRow.locator('.ag-cell').first().tap();
    const tabletSheet = tabletPage.locator('mat-bottom-sheet-container');
    await tabletSheet.getByTestId('row-detail-title').waitFor({ timeout: 10_000 });
    expect(await tabletSheet.locator('dt').allInnerTexts()).toEqual(
      allHeadings.slice(tabletHeadings.length),
    );
    await saveScreenshot(tabletPage, 'tablet-ensembles-row-detail');
    await tablet.close();
  }, 180_000);
});
