import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { demoEmail, startTestApp, type SignedInClient, type TestApp } from '../support/test-app';
import { launchBrowser, localOnlyContext, saveScreenshot, signInAs } from '../support/browser';

let app: TestApp;
let browser: Browser;
let director: SignedInClient;
let coordinator: SignedInClient;

beforeAll(async () => {
  [app, browser] = await Promise.all([startTestApp({ serveWeb: true }), launchBrowser()]);
  [director, coordinator] = await Promise.all([
    app.signIn(demoEmail('director.hpms')),
    app.signIn(demoEmail('coordinator')),
  ]);
});
afterAll(async () => {
  await browser?.close();
  await app?.close();
});

// The mail worker, the webhook and the first load of the lazy Fees screen are asynchronous; the machine is shared.
const patient = { timeout: 45_000 };

describe('a guardian pays the usage fee online', () => {
  it('should sign from the mailbox link, pay with the test card on the hosted page, and show on the Fees screen', async () => {
    const schools = await coordinator.get('/api/schools?code=HPMS');
    const hpmsId = schools.body.rows[0].id as number;
    const instrument = await coordinator.post('/api/instruments', {
      assetTag: 'MB-E2E-PAY-1',
      instrumentId: 'trumpet',
      homeSchoolId: hpmsId,
    });
    expect(instrument.status).toBe(201);
    const students = await coordinator.get(
      `/api/students?schoolId=${hpmsId}&status=active&limit=200`,
    );
    let studentId = 0;
    for (const student of students.body.rows as { id: number; guardianEmail: string | null }[]) {
      if (!student.guardianEmail) continue;
      const loans = await coordinator.get(`/api/loans?studentId=${student.id}&limit=1`);
      if (loans.body.total === 0) {
        studentId = student.id;
        break;
      }
    }
    const loan = await director.post('/api/loans', {
      instrumentId: instrument.body.id,
      studentId,
      conditionOut: 'good',
    });
    expect(loan.status).toBe(201);

    const { context, outside } = await localOnlyContext(browser);
    const page = await context.newPage();
    // Guardians mostly read the e-mail on a phone.
    await page.setViewportSize({ width: 390, height: 844 });
    // The guardian opens the agreement e-mail in the local mailbox, once the mail worker has sent it.
    await expect
      .poll(
        () =>
          app.mail
            .messages()
            .some((message) =>
              message.subject.startsWith('Please sign the instrument loan agreement'),
            ),
        patient,
      )
      .toBe(true);
    await page.goto(app.mail.httpUrl);
    const subject = page
      .getByRole('link', { name: /Please sign the instrument loan agreement/ })
      .first();
    await subject.waitFor(patient);
    await subject.click();
    await page.getByRole('link', { name: 'Text', exact: true }).click();
    const body = await page.locator('body').innerText();
    expect(body).toContain('Pay the usage fee');
    // The e-mail's links carry APP_URL; the test server listens on its own port, so the path is opened there.
    const agreementPath = /\/agreements\/[A-Za-z0-9_-]+/.exec(body)![0];
    await page.goto(`${app.url}${agreementPath}`);
    await page.getByLabel('Your full name (parent or guardian)').fill('Robin Example-Guardian');
    await page.getByLabel(/I have read this agreement/).check();
    await page.getByRole('button', { name: 'Sign the agreement' }).click();
    await page.getByRole('heading', { name: /the agreement is signed/ }).waitFor(patient);
    await saveScreenshot(page, 'fees-guardian-signed');
    await page.getByRole('button', { name: 'Pay the usage fee' }).click();

    // The payment service's hosted page (the local fake).
    await page.getByLabel('Card number').waitFor(patient);
    expect(new URL(page.url()).origin).toBe(app.payments.url);
    await page.getByLabel('Card number').fill('4242 4242 4242 4242');
    await page.getByLabel('Expiry (MM / YY)').fill('12 / 34');
    await page.getByLabel('Security code').fill('123');
    await saveScreenshot(page, 'fees-hosted-payment-page');
    await page.getByRole('button', { name: /^Pay USD 45\.00$/ }).click();
    await page.waitForURL(
      (url) => url.origin === app.url && url.pathname.endsWith('/done'),
      patient,
    );
    await page.getByRole('heading', { name: /Thank you/ }).waitFor(patient);
    await saveScreenshot(page, 'fees-guardian-result');

    // The coordinator's Fees screen shows the payment once the service's event has arrived.
    await app.payments.webhooksSettled();
    const office = await context.newPage();
    await signInAs(office, app.url, demoEmail('coordinator'), '/fees');
    await office.getByRole('heading', { name: 'Fees', level: 1 }).waitFor(patient);
    await office.getByLabel('Student or asset tag').fill('MB-E2E-PAY-1');
    await office.getByLabel('Student or asset tag').press('Enter');
    const row = office.locator(`tr[data-loan="${loan.body.id}"]`);
    await row.waitFor(patient);
    await expect.poll(async () => (await row.innerText()).includes('Paid'), patient).toBe(true);
    expect(await row.innerText()).toContain('$45.00');
    await row.getByRole('button').click();
    await office
      .getByTestId('fee-detail')
      .getByText('Paid online', { exact: true })
      .waitFor(patient);
    await saveScreenshot(office, 'fees-coordinator');
    expect(outside).toEqual([]);
    await context.close();
  });
});
