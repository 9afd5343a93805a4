import { beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { demoEmail, type SignedInClient } from '../support/test-app';
import { useBrowserApp } from '../support/browser-app';
import { dialogReady, localOnlyContext, saveScreenshot, signInAs } from '../support/browser';

const e2e = useBrowserApp();
let coordinator: SignedInClient;
let hpmsId: number;

beforeAll(async () => {
  coordinator = await e2e.app.signIn(demoEmail('coordinator'));
  const schools = await coordinator.get('/api/schools?code=HPMS');
  hpmsId = schools.body.rows[0].id;
});

/** How long a check waits: grid pages, the outbox worker and the mail catcher are asynchronous. */
const patient = { timeout: 20_000 };

function cell(page: Page, index: number, colId: string) {
  return page.locator(`[role=row][row-index="${index}"] [role=gridcell][col-id="${colId}"]`);
}

async function cellText(page: Page, index: number, colId: string): Promise<string> {
  return (await cell(page, index, colId).innerText()).trim();
}

/** An available clarinet at Heron Point and an active student there with a guardian e-mail. */
async function lendableClarinetAndStudent() {
  const instruments = await coordinator.get(
    `/api/instruments?status=available&instrumentId=clarinet&homeSchoolId=${hpmsId}&limit=1`,
  );
  expect(instruments.body.total).toBeGreaterThan(0);
  const students = await coordinator.get(
    `/api/students?schoolId=${hpmsId}&status=active&limit=200`,
  );
  for (const student of students.body.rows as {
    id: number;
    studentNumber: string;
    guardianEmail: string | null;
    guardianName: string | null;
  }[]) {
    if (!student.guardianEmail) continue;
    const loans = await coordinator.get(`/api/loans?studentId=${student.id}&state=active&limit=1`);
    if (loans.body.total === 0) return { instrument: instruments.body.rows[0], student };
  }
  throw new Error('The demo district has no Heron Point student free to borrow.');
}

describe('Instrument fleet screens', () => {
  it('should lend a clarinet, have the guardian sign through the e-mailed link, take it back and clean it', async () => {
    const { instrument, student } = await lendableClarinetAndStudent();
    const { context, outside } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('coordinator'), '/instruments');
    await page.waitForURL(`${e2e.app.url}/instruments`);
    await expect
      .poll(() => page.getByTestId('grid-count').innerText(), patient)
      .toMatch(/^[\d,]+ instruments$/);
    await expect.poll(() => cellText(page, 0, 'status'), patient).not.toBe('');
    await saveScreenshot(page, 'instruments-grid');

    // Check out from the Loans screen.
    await page.goto(`${e2e.app.url}/loans`);
    await page.getByTestId('check-out').click();
    await dialogReady(page);
    await page.getByTestId('instrument-picker').fill(instrument.assetTag);
    await page.getByRole('option', { name: new RegExp(instrument.assetTag) }).click();
    await page.getByTestId('student-picker').fill(student.studentNumber);
    await page.getByRole('option', { name: new RegExp(student.studentNumber) }).click();
    await page.locator('mat-chip-option', { hasText: 'ligature' }).click();
    // The demo fee schedule: 45.00 a year for a woodwind; the dialog shows it, nothing to type.
    await expect
      .poll(() => page.getByTestId('checkout-scheduled-fee').innerText(), patient)
      .toContain('$45.00');
    expect(await page.getByTestId('checkout-fee').count()).toBe(0);
    // The waiver offers only the district's reasons from the fee schedule.
    await page.getByRole('checkbox', { name: 'Waive the fee' }).check();
    await page.getByTestId('checkout-waiver-reason').click({ force: true });
    await expect
      .poll(() => page.locator('mat-option').allInnerTexts(), patient)
      .toEqual(['Family request, approved by the director', 'Free or reduced-price meals']);
    await page.keyboard.press('Escape');
    await expect.poll(() => page.locator('mat-option').count(), patient).toBe(0);
    await page.getByRole('checkbox', { name: 'Waive the fee' }).uncheck();
    await expect.poll(() => page.getByTestId('checkout-scheduled-fee').count(), patient).toBe(1);
    // Let the chip's ripple and the field's label settle before the picture.
    await page.waitForTimeout(600);
    await saveScreenshot(page, 'loan-checkout');
    await page.getByTestId('checkout-save').click();
    await expect
      .poll(() => page.getByTestId('checkout-mailed').innerText(), patient)
      .toContain(student.guardianEmail!);
    await page.getByTestId('checkout-close').click();

    // The outbox worker sends the agreement within seconds; the mail catcher has it then.
    let link = '';
    await expect
      .poll(() => {
        const message = e2e.app.mail
          .messages()
          .find(
            (candidate) =>
              candidate.to.includes(student.guardianEmail!) &&
              candidate.text.includes(instrument.assetTag),
          );
        link = /https?:\/\/\S+\/agreements\/[A-Za-z0-9_-]+/.exec(message?.text ?? '')?.[0] ?? '';
        return link;
      }, patient)
      .not.toBe('');
    // The guardian opens the link in a browser of their own, not signed in to the app. The link
    // carries the configured app address; the test app listens on a port of its own.
    const guardian = await localOnlyContext(e2e.browser);
    const signing = await guardian.context.newPage();
    await signing.goto(`${e2e.app.url}${new URL(link).pathname}`);
    await expect.poll(() => signing.locator('h1').innerText()).toContain('Loan agreement for');
    await saveScreenshot(signing, 'loan-signing');
    await signing.locator('#signedName').fill('Avery Quillon');
    await signing.locator('input[name=agree]').check();
    await signing.getByRole('button', { name: 'Sign the agreement' }).click();
    await expect
      .poll(() => signing.locator('h1').innerText())
      .toBe('Thank you: the agreement is signed');
    expect(guardian.outside).toEqual([]);
    await guardian.context.close();

    // Back in the app, the loan reads as signed.
    await page.goto(`${e2e.app.url}/loans?q=${instrument.assetTag}`);
    await expect.poll(() => page.getByTestId('grid-count').innerText(), patient).toBe('1 loan');
    await expect.poll(() => cellText(page, 0, 'agreement'), patient).toBe('Signed');
    await cell(page, 0, 'assetTag').click();
    await expect
      .poll(() => page.getByTestId('loan-agreement').innerText())
      .toContain('by Avery Quillon');
    await saveScreenshot(page, 'loans');

    // A returned wind instrument waits to be cleaned.
    await page.getByTestId('return-loan').click();
    await expect.poll(() => page.getByTestId('return-cleaning').innerText()).toContain('to clean');
    expect(await page.getByTestId('return-cleaning').innerText()).not.toMatch(/\bto to\b/);
    await page.getByTestId('return-save').click();
    await expect
      .poll(() => page.getByTestId('loan-panel').innerText(), patient)
      .toContain('Returned');
    await page.goto(`${e2e.app.url}/instruments/${instrument.id}`);
    // An asset tag is one token: it does not break at its hyphen, even on a phone.
    await page.setViewportSize({ width: 360, height: 740 });
    const tag = page.getByTestId('instrument-title').locator('.tb-asset-tag');
    await tag.waitFor();
    const lines = await tag.evaluate((element) => element.getClientRects().length);
    expect(lines).toBe(1);
    await page.setViewportSize({ width: 1360, height: 860 });
    await expect
      .poll(() => page.getByTestId('instrument-status').innerText(), patient)
      .toBe('To clean');
    await expect
      .poll(() => page.getByTestId('to-clean').innerText())
      .toContain('Mouthpieces and reeds are personal.');
    const timeline = await page.getByTestId('timeline').innerText();
    expect(timeline).toContain('Lent out');
    expect(timeline).toContain('Returned');
    await saveScreenshot(page, 'instrument-detail');
    await page.getByTestId('record-cleaned').click();
    await expect
      .poll(() => page.getByTestId('instrument-status').innerText(), patient)
      .toBe('Available');
    await expect
      .poll(() => page.getByTestId('timeline').innerText())
      .toContain('Cleaned and sanitised');
    const after = await coordinator.get(`/api/instruments/${instrument.id}`);
    expect(after.body.status).toBe('available');

    // The instrument's own page has the list's actions: its label, a repair, and lending it.
    const label = page.getByTestId('instrument-label');
    await page.getByTestId('labels-used').fill('4');
    await expect
      .poll(() => label.getAttribute('href'))
      .toBe(`/api/instruments/labels.pdf?instrumentId=${instrument.id}&skip=4`);
    expect(await page.getByTestId('instrument-repair').isVisible()).toBe(true);
    expect(await page.getByTestId('instrument-return').count()).toBe(0);
    await page.getByTestId('instrument-lend').click();
    const lendDialog = page.getByRole('dialog');
    await expect
      .poll(() => lendDialog.getByTestId('instrument-picker').inputValue(), patient)
      .toContain(instrument.assetTag);
    await saveScreenshot(page, 'instrument-lend');
    await page.keyboard.press('Escape');
    expect(outside).toEqual([]);
    await context.close();
  });

  it('should reconcile typed asset tags in a count and warn before marking the rest missing', async () => {
    const shelf = await coordinator.get(
      `/api/instruments?status=available&homeSchoolId=${hpmsId}&limit=2&sort=assetTag:asc`,
    );
    const [first, second] = shelf.body.rows as { assetTag: string }[];
    const { context } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('director.hpms'), '/counts');
    await page.waitForURL(`${e2e.app.url}/counts`);
    await page.getByTestId('count-start').click();
    await page.waitForURL(/\/counts\/\d+$/);
    const box = page.getByTestId('count-scan');
    await box.fill(first!.assetTag);
    await box.press('Enter');
    await box.fill(`${second!.assetTag}\nNOT-A-TAG-9`);
    await box.press('Enter');
    const group = (id: string) =>
      page.locator(`[data-group="${id}"] [data-testid=group-count]`).innerText();
    await expect.poll(() => group('found'), patient).toBe('2');
    await expect.poll(() => group('unknown'), patient).toBe('1');
    const notFound = Number(await group('not-found'));
    expect(notFound).toBeGreaterThan(0);
    await saveScreenshot(page, 'counts');
    await page.getByTestId('count-close').click();
    await expect
      .poll(() => page.getByRole('dialog').innerText())
      .toContain(`${notFound} instruments not found will be marked missing.`);
    await page.getByRole('button', { name: 'Cancel' }).click();
    await context.close();
  });

  it('should let a technician open a repair ticket that puts the instrument in repair', async () => {
    const shelf = await coordinator.get(
      `/api/instruments?status=available&instrumentId=trumpet&homeSchoolId=${hpmsId}&limit=1`,
    );
    const trumpet = shelf.body.rows[0] as { id: number; assetTag: string };
    const { context } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('technician'), '/repairs');
    await page.waitForURL(`${e2e.app.url}/repairs`);
    await expect
      .poll(() => page.getByRole('note').first().innerText())
      .toContain('go to a qualified repair technician');
    await page.getByTestId('new-repair').click();
    await dialogReady(page);
    await page.getByTestId('instrument-picker').fill(trumpet.assetTag);
    await page.getByRole('option', { name: new RegExp(trumpet.assetTag) }).click();
    await page.getByTestId('repair-problem').fill('Third valve sticks after oiling');
    await page.getByTestId('repair-save').click();
    await expect.poll(() => cellText(page, 0, 'assetTag'), patient).toBe(trumpet.assetTag);
    expect(await cellText(page, 0, 'status')).toBe('Open');
    await saveScreenshot(page, 'repairs');
    const after = await coordinator.get(`/api/instruments/${trumpet.id}`);
    expect(after.body.status).toBe('in-repair');
    await context.close();
  });

  it('should show a student only their own loans', async () => {
    const student = await e2e.app.signIn(demoEmail('student.hpms'));
    const own = await student.get('/api/loans?limit=50');
    expect(own.body.total).toBeGreaterThan(0);
    const { context } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('student.hpms'), '/loans');
    await expect.poll(() => page.locator('h1').innerText(), patient).toBe('My instruments');
    await expect.poll(() => page.getByTestId('my-loan').count(), patient).toBe(own.body.total);
    expect(await page.getByTestId('my-loan').first().innerText()).toContain(
      own.body.rows[0].assetTag,
    );
    await context.close();
  });

  it('should total the replacement plan by school and list shortages', async () => {
    const { context } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('coordinator'), '/planning');
    await expect.poll(() => page.getByTestId('horizon-total').innerText(), patient).toMatch(/^\$/);
    const plan = await coordinator.get('/api/planning/replacement');
    const fiveYears = plan.body.horizons.find((horizon: { years: number }) => horizon.years === 5);
    await page.getByRole('radio', { name: '5 years' }).click();
    await expect
      .poll(() => page.getByTestId('horizon-count').innerText())
      .toBe(String(fiveYears.count));
    await saveScreenshot(page, 'planning');
    await context.close();
  });
});
