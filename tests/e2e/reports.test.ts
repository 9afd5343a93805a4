import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { listResponseSchema } from '@shared/api/list';
import { reportPreviewSchema, reportRunSchema } from '@shared/api/report';
import { schoolSchema } from '@shared/api/school';
import { demoEmail } from '../support/test-app';
import { useBrowserApp } from '../support/browser-app';
import { localOnlyContext, saveScreenshot, signInAs } from '../support/browser';

const e2e = useBrowserApp();

/** How long a check waits: previews are assembled on the server, mail goes out within seconds. */
const patient = { timeout: 30_000, interval: 500 };

async function apiGet(page: Page, path: string): Promise<unknown> {
  return page.evaluate(async (target) => (await fetch(target)).json(), path);
}

describe('Reports', () => {
  it('should preview a director report, send it to the school directors, and show it sent in the mailbox and the outbox', async () => {
    const { context, outside } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('coordinator'), '/reports');
    await page.waitForURL(`${e2e.app.url}/reports`);
    // A select with no options yet does not open: wait for the schools (the first is chosen).
    await expect.poll(() => page.getByTestId('report-school').innerText(), patient).toMatch(/ · /);
    await page.getByTestId('report-school').click();
    await page.getByRole('option', { name: /^HPMS/ }).click();

    // The period defaults to the last 7 days, today included.
    const from = await page.getByLabel('From', { exact: true }).inputValue();
    const to = await page.getByLabel('To', { exact: true }).inputValue();
    expect((Date.parse(to) - Date.parse(from)) / 86_400_000).toBe(6);

    // The preview is the server's own HTML in a frame with every sandbox restriction on.
    const frame = page.getByTestId('report-preview').locator('iframe');
    await expect.poll(() => frame.getAttribute('srcdoc'), patient).toContain('Heron Point Middle');
    expect(await frame.getAttribute('sandbox')).toBe('');
    const schools = listResponseSchema(schoolSchema).parse(
      await apiGet(page, '/api/schools?limit=50'),
    );
    const hpms = schools.rows.find((school) => school.code === 'HPMS')!;
    const preview = reportPreviewSchema.parse(
      await apiGet(
        page,
        `/api/reports/preview?kind=director&schoolId=${hpms.id}&from=${from}&to=${to}`,
      ),
    );
    expect(await frame.getAttribute('srcdoc')).toBe(preview.html);
    await expect
      .poll(
        () => page.frameLocator('[data-testid=report-preview] iframe').locator('body').innerText(),
        patient,
      )
      .toContain('Heron Point Middle');
    await page.evaluate(() => document.fonts.ready);
    await saveScreenshot(page, 'report-preview');
    await page.getByRole('tab', { name: 'Plain text' }).click();
    await expect
      .poll(async () => (await page.getByTestId('report-text').innerText()).trim())
      .toBe(preview.text.trim());

    // A test first: one message to the coordinator alone, its subject marked as a test.
    await page.getByTestId('send-test').click();
    await expect
      .poll(() => page.getByTestId('send-result').innerText(), patient)
      .toContain(`A test went to ${demoEmail('coordinator')}`);
    const testSubject = `Test: Heron Point Middle (HPMS): director report, ${from} to ${to}`;
    await expect
      .poll(
        () =>
          e2e.app.mail
            .messages()
            .filter((message) => message.subject === testSubject)
            .flatMap((message) => message.to),
        patient,
      )
      .toEqual([demoEmail('coordinator')]);
    await saveScreenshot(page, 'report-test-sent');

    // Send to the school's directors, through the confirm dialog.
    await page.getByRole('button', { name: 'Send now…' }).click();
    const dialog = page.getByRole('dialog');
    expect(
      await dialog.getByRole('radio', { name: "Heron Point Middle's directors" }).isChecked(),
    ).toBe(true);
    await dialog.getByRole('button', { name: 'Send now' }).click();
    const result = page.getByTestId('send-result');
    await expect
      .poll(() => result.innerText(), patient)
      .toMatch(/^Queued \d+ messages? — see Outbox$/);
    const queued = Number(/Queued (\d+)/.exec(await result.innerText())![1]);

    const runs = listResponseSchema(reportRunSchema).parse(
      await apiGet(page, '/api/reports?sort=createdAt:desc&limit=1'),
    );
    const run = runs.rows[0]!;
    expect(run).toMatchObject({ kind: 'director', schoolCode: 'HPMS', from, to, scheduleId: null });
    expect(run.recipients).toContain(demoEmail('director.hpms'));
    expect(run.recipients.length).toBe(queued);

    // The worker delivers within seconds: the mail catcher holds one message per director.
    const subject = `Heron Point Middle (HPMS): director report, ${from} to ${to}`;
    await expect
      .poll(
        () =>
          e2e.app.mail
            .messages()
            .filter((message) => message.subject === subject)
            .flatMap((message) => message.to)
            .sort(),
        patient,
      )
      .toEqual([...run.recipients].sort());
    const mailbox = await context.newPage();
    await mailbox.goto(e2e.app.mail.httpUrl);
    expect(await mailbox.locator('body').innerText()).toContain(subject);
    await mailbox.close();

    // The Outbox screen shows each of them sent.
    await page.getByRole('link', { name: 'Outbox' }).first().click();
    await page.waitForURL(`${e2e.app.url}/reports/outbox`);
    // The test sent before is in the outbox too, its subject marked "Test:".
    const rows = page
      .getByTestId('outbox-list')
      .locator('tbody tr')
      .filter({ hasText: subject, hasNotText: 'Test:' });
    await expect.poll(() => rows.count(), patient).toBe(queued);
    await expect
      .poll(async () => new Set(await rows.locator('td:nth-child(4)').allInnerTexts()), patient)
      .toEqual(new Set(['Sent']));
    await page.evaluate(() => document.fonts.ready);
    await saveScreenshot(page, 'outbox');

    // One message in detail: its HTML part in a sandboxed frame, its state and attempts.
    await rows.first().getByRole('link').click();
    await expect.poll(() => page.locator('#message-subject').innerText(), patient).toBe(subject);
    expect(await page.locator('tb-outbox-state').innerText()).toBe('Sent');
    expect(await page.locator('tb-mail-frame iframe').getAttribute('sandbox')).toBe('');
    expect(outside).toEqual([]);
    await context.close();
  });

  it('should let a director send their own school report to themselves only', async () => {
    const { context } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('director.hpms'), '/reports');
    await page.waitForURL(`${e2e.app.url}/reports`);
    await expect
      .poll(
        () => page.getByTestId('report-preview').locator('iframe').getAttribute('srcdoc'),
        patient,
      )
      .toContain('Heron Point Middle');
    // No district summary and no schedules for a director.
    expect(await page.getByRole('button', { name: 'District summary' }).count()).toBe(0);
    expect(await page.getByRole('link', { name: 'Schedules' }).count()).toBe(0);
    await page.getByRole('button', { name: 'Send now…' }).click();
    const dialog = page.getByRole('dialog');
    expect(await dialog.innerText()).toContain(
      `It goes to you only, at ${demoEmail('director.hpms')}.`,
    );
    expect(await dialog.getByRole('radio').count()).toBe(0);
    await dialog.getByRole('button', { name: 'Send now' }).click();
    await expect
      .poll(() => page.getByTestId('send-result').innerText(), patient)
      .toBe('Queued 1 message — see Outbox');
    const runs = listResponseSchema(reportRunSchema).parse(
      await apiGet(page, '/api/reports?sort=createdAt:desc&limit=1'),
    );
    expect(runs.rows[0]!.recipients).toEqual([demoEmail('director.hpms')]);
    await context.close();
  });

  it('should make, pause and delete a weekly schedule with its next run shown', async () => {
    const { context } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('coordinator'), '/reports/schedules');
    await page.waitForURL(`${e2e.app.url}/reports/schedules`);
    await expect
      .poll(() => page.locator('form[aria-labelledby=new-schedule] .summary').innerText(), patient)
      .toBe('Every Monday at 07:00, America/Los_Angeles.');
    await page.getByRole('button', { name: 'Add schedule' }).click();
    const list = page.getByTestId('schedule-list');
    const row = list.locator('tbody tr').first();
    await expect.poll(() => row.innerText(), patient).toContain('Every Monday at 07:00');
    const stored = (await apiGet(page, '/api/reports/schedules')) as {
      rows: { cron: string; timeZone: string; nextRunAt: string }[];
    };
    expect(stored.rows).toHaveLength(1);
    expect(stored.rows[0]).toMatchObject({ cron: '0 7 * * 1', timeZone: 'America/Los_Angeles' });
    // The next run is a Monday at 07:00 in Los Angeles, as the row shows it.
    const nextRun = new Intl.DateTimeFormat('en-US', {
      weekday: 'short',
      hour: '2-digit',
      minute: '2-digit',
      hourCycle: 'h23',
      timeZone: 'America/Los_Angeles',
    }).format(new Date(stored.rows[0]!.nextRunAt));
    expect(nextRun).toBe('Mon 07:00');
    expect(await row.locator('td:nth-child(5)').innerText()).toMatch(/^Mon, .+, 07:00$/);

    await row.getByRole('button', { name: 'Pause' }).click();
    await expect.poll(() => row.locator('td:nth-child(5)').innerText(), patient).toBe('Paused');
    await row.getByRole('button', { name: 'Delete' }).click();
    await row.getByRole('button', { name: 'Yes, delete' }).click();
    await expect.poll(() => page.getByText('No schedules yet').count(), patient).toBe(1);
    await context.close();
  });
});
