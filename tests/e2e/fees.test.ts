import { beforeAll, describe, expect, it } from 'vitest';
import { demoEmail, type SignedInClient } from '../support/test-app';
import { useBrowserApp } from '../support/browser-app';
import { localOnlyContext, saveScreenshot, signInAs } from '../support/browser';

const e2e = useBrowserApp();
let director: SignedInClient;
let coordinator: SignedInClient;

beforeAll(async () => {
  [director, coordinator] = await Promise.all([
    e2e.app.signIn(demoEmail('director.hpms')),
    e2e.app.signIn(demoEmail('coordinator')),
  ]);
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

    const { context, outside } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    // Guardians mostly read the e-mail on a phone.
    await page.setViewportSize({ width: 390, height: 844 });
    // The guardian opens the agreement e-mail in the local mailbox, once the mail worker has sent it.
    await expect
      .poll(
        () =>
          e2e.app.mail
            .messages()
            .some((message) =>
              message.subject.startsWith('Please sign the instrument loan agreement'),
            ),
        patient,
      )
      .toBe(true);
    await page.goto(e2e.app.mail.httpUrl);
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
    await page.goto(`${e2e.app.url}${agreementPath}`);
    await page.getByLabel('Your full name (parent or guardian)').fill('Robin Example-Guardian');
    await page.getByLabel(/I have read this agreement/).check();
    await page.getByRole('button', { name: 'Sign the agreement' }).click();
    await page.getByRole('heading', { name: /the agreement is signed/ }).waitFor(patient);
    await saveScreenshot(page, 'fees-guardian-signed');
    await page.getByRole('button', { name: 'Pay the usage fee' }).click();

    // The payment service's hosted page (the local fake).
    await page.getByLabel('Card number').waitFor(patient);
    expect(new URL(page.url()).origin).toBe(e2e.app.payments.url);
    await page.getByLabel('Card number').fill('4242 4242 4242 4242');
    await page.getByLabel('Expiry (MM / YY)').fill('12 / 34');
    await page.getByLabel('Security code').fill('123');
    await saveScreenshot(page, 'fees-hosted-payment-page');
    await page.getByRole('button', { name: /^Pay USD 45\.00$/ }).click();
    await page.waitForURL(
      (url) => url.origin === e2e.app.url && url.pathname.endsWith('/done'),
      patient,
    );
    await page.getByRole('heading', { name: /Thank you/ }).waitFor(patient);
    await saveScreenshot(page, 'fees-guardian-result');

    // The coordinator's Fees screen shows the payment once the service's event has arrived.
    await e2e.app.payments.webhooksSettled();
    const office = await context.newPage();
    await signInAs(office, e2e.app.url, demoEmail('coordinator'), '/fees');
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

describe('the fee schedule and the loan agreement text live in District settings', () => {
  it('should edit both on the District settings screen and link there from the Fees and Loans screens', async () => {
    const { context, outside } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('coordinator'), '/fees');
    await page.getByRole('heading', { name: 'Fees', level: 1 }).waitFor(patient);
    // The Fees screen no longer edits the schedule; it sends the coordinator to District settings.
    const feesLink = page.getByTestId('fee-schedule-link');
    await feesLink.waitFor(patient);
    expect(await page.getByTestId('save-schedule').count()).toBe(0);
    await feesLink.getByRole('link', { name: 'Edit in District settings' }).click();
    await page.waitForURL(`${e2e.app.url}/district#fee-schedule`, patient);

    // Both sections are on the District settings screen.
    await page.getByRole('heading', { name: 'District settings', level: 1 }).waitFor(patient);
    const schedule = page.getByTestId('fee-schedule');
    const agreement = page.getByTestId('agreement-text');
    await schedule.getByRole('heading', { name: 'Fee schedule' }).waitFor(patient);
    await agreement.getByRole('heading', { name: 'Loan agreement text' }).waitFor(patient);

    // The fee schedule: change the first line's yearly fee and save it through PUT /api/fees/schedule.
    const before = (await coordinator.get('/api/fees/schedule').expect(200)).body as {
      entries: { key: string; yearlyFeeCents: number }[];
    };
    const first = before.entries[0]!;
    const newCents = first.yearlyFeeCents + 1_250;
    const feeInput = schedule.getByLabel(`Yearly fee for ${first.key}`);
    await feeInput.fill((newCents / 100).toFixed(2));
    await feeInput.press('Tab');
    await schedule.getByTestId('save-schedule').click();
    await schedule.getByText('Fee schedule saved').waitFor(patient);
    const after = (await coordinator.get('/api/fees/schedule').expect(200)).body as typeof before;
    expect(after.entries.find((entry) => entry.key === first.key)?.yearlyFeeCents).toBe(newCents);

    // The agreement text: a new version through PUT /api/loans/agreement-text.
    const textBefore = (await coordinator.get('/api/loans/agreement-text').expect(200)).body as {
      text: string;
      version: number;
    };
    const textArea = agreement.getByLabel('Agreement text');
    await expect.poll(() => textArea.inputValue(), patient).toBe(textBefore.text);
    const newText = `${textBefore.text}\n\n8. Merrow Basin test clause: the case tag stays on the case.`;
    await textArea.fill(newText);
    await agreement.getByTestId('save-agreement').click();
    await agreement.getByText(`Saved as version ${textBefore.version + 1}`).waitFor(patient);
    const textAfter = (await coordinator.get('/api/loans/agreement-text').expect(200)).body as {
      text: string;
      version: number;
    };
    expect(textAfter).toMatchObject({ text: newText, version: textBefore.version + 1 });
    await agreement.scrollIntoViewIfNeeded();
    await saveScreenshot(page, 'district-settings-agreement-and-fees');

    // The Loans screen links the coordinator to the agreement text's new home.
    await page.goto(`${e2e.app.url}/loans`);
    await page.getByTestId('agreement-text-link').click();
    await page.waitForURL(`${e2e.app.url}/district#agreement-text`, patient);
    await page.getByTestId('agreement-text').waitFor(patient);

    // A director still reads the schedule on the Fees screen, without editing it or the link.
    expect(outside).toEqual([]);
    await context.close();
    const { context: directorContext } = await localOnlyContext(e2e.browser);
    const directorPage = await directorContext.newPage();
    await signInAs(directorPage, e2e.app.url, demoEmail('director.hpms'), '/fees');
    const readOnly = directorPage.getByTestId('fee-schedule');
    await readOnly.getByRole('heading', { name: 'Fee schedule' }).waitFor(patient);
    // The director reads the fee the coordinator just saved.
    await expect
      .poll(() => readOnly.locator('tbody').innerText(), patient)
      .toContain(`$${(newCents / 100).toFixed(2)}`);
    expect(await directorPage.getByTestId('save-schedule').count()).toBe(0);
    expect(await directorPage.getByTestId('fee-schedule-link').count()).toBe(0);
    await directorContext.close();
  });
});
