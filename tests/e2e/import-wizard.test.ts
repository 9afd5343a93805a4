import { describe, expect, it } from 'vitest';
import { rowsOf } from '../../server/db/client';
import { demoEmail } from '../support/test-app';
import { useBrowserApp } from '../support/browser-app';
import { localOnlyContext, saveScreenshot, signInAs } from '../support/browser';

const e2e = useBrowserApp();

// "Pupil Number" is a header the column guess does not know; line 3 has a grade above 12.
const roster = [
  'Pupil Number,First Name,Last Name,Grade Level,School,Ensemble,Instrument,Parent Email',
  'E2E-0001,Marisol,Quennell,7,HPMS,Concert Band,Alto Saxophone,quennell.family@merrowbasin.example',
  'E2E-0002,Teodor,Vashti,15,HPMS,Concert Band,trumpet,',
  'E2E-0003,Ilse,Brackwater,8,QHMS,Jazz Band,trombone,',
].join('\n');

describe('Roster import wizard', () => {
  it('should upload, fix the mapping, show the remaining error, skip it and commit', async () => {
    const { context, outside } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('coordinator'), '/imports');
    await page.waitForURL(`${e2e.app.url}/imports`);
    await expect.poll(() => page.locator('h1').innerText()).toBe('Imports');
    expect(await page.locator('nav[aria-label="Main"] a.item').allInnerTexts()).toContain(
      'Imports',
    );

    await page.getByTestId('roster-file').setInputFiles({
      name: 'spring-roster.csv',
      mimeType: 'text/csv',
      buffer: Buffer.from(roster),
    });
    const studentIdSelect = page.getByTestId('map-studentId');
    await studentIdSelect.waitFor();
    await expect.poll(() => studentIdSelect.innerText()).toContain('not in this file');
    await expect.poll(() => page.getByTestId('map-grade').innerText()).toContain('Grade Level');
    await studentIdSelect.click();
    await page.getByRole('option', { name: 'Pupil Number' }).click();
    await expect.poll(() => studentIdSelect.innerText()).toContain('Pupil Number');
    await page.locator('.mat-mdc-select-panel').waitFor({ state: 'detached' });
    await saveScreenshot(page, 'import-mapping');

    await page.getByTestId('check-rows').click();
    const errorList = page.getByTestId('error-list');
    await errorList.waitFor();
    expect(await errorList.innerText()).toContain("Grade must be K or 1 to 12; got '15'.");
    await expect
      .poll(() => page.getByTestId('plan-counts').innerText())
      .toContain('2\nrows add new students');
    const wrongGrade = page.locator('[role=row][row-index="1"] [col-id="grade"]');
    await expect.poll(() => wrongGrade.getAttribute('class')).toContain('tb-cell-wrong');
    expect(
      await page.locator('[role=row][row-index="0"] [col-id="grade"]').getAttribute('class'),
    ).not.toContain('tb-cell-wrong');
    await page
      .getByTestId('plan-counts')
      .evaluate((element) => element.scrollIntoView({ block: 'center' }));
    await saveScreenshot(page, 'import-preview');

    // A step is ticked only once it is done: the Commit step is not, after a visit and a step back.
    const stepIcon = (label: string) =>
      page
        .locator('mat-step-header', { hasText: label })
        .locator('.mat-step-icon')
        .getAttribute('class');
    await page.getByRole('button', { name: 'Continue' }).click();
    const commit = page.getByTestId('commit');
    await commit.waitFor();
    await page.getByRole('button', { name: 'Back', exact: true }).click();
    await expect.poll(() => stepIcon('Commit')).toContain('mat-step-icon-state-number');
    await page.getByRole('button', { name: 'Continue' }).click();
    await commit.waitFor();
    expect(await stepIcon('Preview')).not.toContain('mat-step-icon-state-number');
    expect(await commit.isDisabled()).toBe(true);
    // The disabled Import button says why beside it.
    expect(await page.getByTestId('commit-why').innerText()).toContain(
      'Tick “Skip the 1 row with errors” above to import the rest',
    );
    expect(await commit.getAttribute('aria-describedby')).toBe('commit-why');
    await saveScreenshot(page, 'import-commit-waiting');
    await page.getByTestId('skip-invalid').locator('input').check();
    await expect.poll(() => page.getByTestId('commit-why').count()).toBe(0);
    await expect.poll(() => commit.isDisabled()).toBe(false);
    await commit.click();
    await expect
      .poll(() => page.getByTestId('import-result').innerText())
      .toContain(
        '2 rows added new students, 0 changed students, 0 unchanged, 0 students were marked withdrawn; 1 row with errors was skipped.',
      );
    expect(await stepIcon('Commit')).not.toContain('mat-step-icon-state-number');
    await saveScreenshot(page, 'import-done');

    const found = await page.evaluate(async () => {
      const response = await fetch('/api/students?q=Quennell');
      return {
        status: response.status,
        body: response.status === 200 ? await response.json() : null,
      };
    });
    if (found.status === 200) {
      expect(found.body.rows.map((row: { studentNumber: string }) => row.studentNumber)).toContain(
        'E2E-0001',
      );
    } else {
      const rows = rowsOf(
        await e2e.app.database.db.execute(
          `select 1 from students where student_number = 'E2E-0001'` as never,
        ),
      );
      expect(rows).toHaveLength(1);
    }
    const skipped = rowsOf(
      await e2e.app.database.db.execute(
        `select 1 from students where student_number = 'E2E-0002'` as never,
      ),
    );
    expect(skipped).toHaveLength(0);

    await page.getByRole('tab', { name: 'History' }).click();
    const history = page.getByTestId('import-history');
    await history.waitFor();
    expect(await history.innerText()).toContain('spring-roster.csv');
    expect(await history.innerText()).toContain('Committed');
    await saveScreenshot(page, 'import-history');

    // Undo it from the history: the preview first, then the undo, all or nothing.
    await page.getByTestId('undo-import').first().click();
    const effects = page.getByTestId('undo-effects');
    await effects.waitFor();
    expect(await effects.innerText()).toContain('remove 2 students it created');
    // The picture once the dialog has finished opening (Material fades it in).
    await page
      .locator('.mat-mdc-dialog-container.mdc-dialog--open:not(.mdc-dialog--opening)')
      .waitFor();
    await saveScreenshot(page, 'import-undo');
    await page.getByTestId('undo-confirm').click();
    await expect
      .poll(() => page.getByTestId('undo-done').innerText())
      .toContain('was undone: 2 students removed');
    await expect.poll(() => history.innerText()).toContain('Undone');
    expect(await page.getByTestId('undo-import').count()).toBe(0);
    const gone = rowsOf(
      await e2e.app.database.db.execute(
        `select 1 from students where student_number in ('E2E-0001', 'E2E-0003')` as never,
      ),
    );
    expect(gone).toHaveLength(0);
    await saveScreenshot(page, 'import-history-undone');
    expect(outside).toEqual([]);
    await context.close();
  });
});
