import fs from 'node:fs';
import * as tar from 'tar';
import { describe, expect, it } from 'vitest';
import { demoEmail } from '../support/test-app';
import { useBrowserApp } from '../support/browser-app';
import {
  chooseOption,
  dialogReady,
  localOnlyContext,
  saveScreenshot,
  signInAs,
} from '../support/browser';

const e2e = useBrowserApp();

const newDirector = 'cosima.reedholt@merrowbasin.example';

describe('People screen', () => {
  it('should let the coordinator download a backup of the database and its files', async () => {
    const { context, outside } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('coordinator'), '/people');
    await expect.poll(() => page.locator('h1').innerText()).toBe('People');
    const link = page.getByRole('link', { name: 'Download a backup' });
    const [download] = await Promise.all([page.waitForEvent('download'), link.click()]);
    expect(download.suggestedFilename()).toMatch(/^tuttiboard-backup-.*\.tar\.gz$/);
    const bytes = fs.readFileSync(await download.path());
    // gzip member header: ID1 = 0x1f, ID2 = 0x8b (RFC 1952, 2.3.1).
    expect([bytes[0], bytes[1]]).toEqual([0x1f, 0x8b]);
    const names: string[] = [];
    await tar.t({ file: await download.path(), onReadEntry: (entry) => names.push(entry.path) });
    expect(names.slice(0, 2)).toEqual(['manifest.json', 'database.tar']);
    expect(outside).toEqual([]);
    await context.close();
  });

  it('should let the coordinator add a director for QHMS and make an API token shown once', async () => {
    const { context, outside } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('coordinator'), '/people');
    await page.waitForURL(`${e2e.app.url}/people`);
    await expect.poll(() => page.locator('h1').innerText()).toBe('People');
    const table = page.getByTestId('people-table');
    await expect.poll(() => table.innerText()).toContain('Ines Tallowbrook');

    await page.getByTestId('add-person').click();
    await dialogReady(page);
    await page.getByTestId('person-name').fill('Cosima Reedholt');
    await page.getByTestId('person-email').fill(newDirector);
    await chooseOption(page, 'person-schools', 'Quarry Hill Middle (QHMS)');
    await page.keyboard.press('Escape');
    await page.getByRole('listbox').waitFor({ state: 'detached' });
    await saveScreenshot(page, 'person-add-dialog');
    await page.getByTestId('save-person').click();
    await expect
      .poll(() => page.getByTestId('people-notice').innerText())
      .toContain('Cosima Reedholt is added');

    const row = page.locator(`tr[data-email="${newDirector}"]`);
    await expect.poll(() => row.innerText()).toContain('Director');
    expect(await row.innerText()).toContain('QHMS');
    expect(await row.innerText()).toContain('Never');
    const stored = await e2e.app.database.db.execute(
      `select u.role, s.code from users u join user_schools us on us.user_id = u.id join schools s on s.id = us.school_id where u.email = '${newDirector}'` as never,
    );
    expect((stored as unknown as { rows: unknown[] }).rows).toEqual([
      { role: 'director', code: 'QHMS' },
    ]);
    await page.evaluate(() => document.fonts.ready);
    await saveScreenshot(page, 'people-list');

    await page.getByRole('tab', { name: 'API tokens' }).click();
    await page.getByTestId('token-label').fill('Nightly roster export');
    await page.getByTestId('token-lifetime').click();
    await page.getByRole('option', { name: 'A year' }).click();
    await page.getByRole('listbox').waitFor({ state: 'detached' });
    await page.getByTestId('create-token').click();
    const shown = page.getByTestId('new-token');
    await expect.poll(() => shown.innerText()).toMatch(/^tutti_\S{20,}$/);
    const token = (await shown.innerText()).trim();
    expect(await page.getByRole('dialog').innerText()).toContain('only time it is shown');
    const nextYear = String(new Date().getFullYear() + 1);
    expect(await page.getByRole('dialog').innerText()).toMatch(
      new RegExp(`Works until .*${nextYear}`),
    );
    await saveScreenshot(page, 'token-shown-once');

    const me = await page.evaluate(async (bearer) => {
      const response = await fetch('/api/me', { headers: { Authorization: `Bearer ${bearer}` } });
      return {
        status: response.status,
        email: ((await response.json()) as { email: string }).email,
      };
    }, token);
    expect(me).toEqual({ status: 200, email: demoEmail('coordinator') });

    await page.getByTestId('token-done').click();
    await page.getByRole('dialog').waitFor({ state: 'detached' });
    const tokens = page.getByTestId('token-table');
    await expect.poll(() => tokens.innerText()).toContain('Nightly roster export');
    expect(await page.locator('body').innerText()).not.toContain(token);
    await page.reload();
    await page.getByRole('tab', { name: 'API tokens' }).click();
    const listed = page.locator('[data-testid="token-table"] tbody tr', {
      hasText: 'Nightly roster export',
    });
    await expect.poll(() => listed.innerText()).toContain('Live');
    // A year's lifetime: the Expires column reads next year's date.
    expect(await listed.innerText()).toContain(nextYear);
    // The script's call above is the token's last use, so it no longer reads "Never".
    expect(await listed.innerText()).not.toContain('Never');
    expect(await page.content()).not.toContain(token);

    await page.getByRole('tab', { name: 'Audit log' }).click();
    const audit = page.getByTestId('audit-table');
    const created = audit.locator('tr.entry', { hasText: 'Cosima Reedholt' });
    await expect.poll(() => created.innerText()).toContain('create');
    await created.getByRole('button', { name: 'Show before and after' }).click();
    const detail = audit.locator('tr.detail');
    await expect.poll(() => detail.innerText()).toContain(newDirector);
    expect(await detail.innerText()).toContain('QHMS');
    const signIn = audit.locator('tr.entry', { hasText: 'sign-in' }).first();
    expect(await signIn.innerText()).toContain('Renata Okonkwo-Hale');
    await saveScreenshot(page, 'people-audit');
    expect(outside).toEqual([]);
    await context.close();
  });

  it('should give a director their own API tokens page and no People screen', async () => {
    const { context } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('director.qhms'), '/account/tokens');
    await page.waitForURL(`${e2e.app.url}/account/tokens`);
    const rail = page.locator('nav[aria-label="Main"] a.item');
    await expect.poll(() => rail.allInnerTexts()).toContain('API tokens');
    expect(await rail.allInnerTexts()).not.toContain('People');
    await page.getByTestId('create-token').click();
    await expect.poll(() => page.getByTestId('new-token').innerText()).toMatch(/^tutti_/);
    await page.getByTestId('token-done').click();
    await page.getByRole('dialog').waitFor({ state: 'detached' });
    const tokens = page.getByTestId('token-table');
    await expect.poll(() => tokens.innerText()).toContain('Live');
    expect(await tokens.innerText()).not.toContain('Nightly roster export');
    await page.getByRole('button', { name: /^Revoke the token/ }).click();
    await page.getByTestId('confirm-revoke').click();
    await expect.poll(() => tokens.innerText()).toContain('Revoked');
    await context.close();
  });
});
