import { describe, expect, it } from 'vitest';
import { demoEmail } from '../support/test-app';
import { useBrowserApp } from '../support/browser-app';
import { localOnlyContext, saveScreenshot, signInAs } from '../support/browser';

const e2e = useBrowserApp();

async function railLabels(page: import('playwright-core').Page) {
  return page.locator('nav[aria-label="Main"] a.item').allInnerTexts();
}

describe('App shell', () => {
  it('should sign a director in and show their school, name and navigation', async () => {
    const { context, outside } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('director.hpms'));
    await page.waitForURL(`${e2e.app.url}/overview`);
    await expect.poll(() => page.getByTestId('user-name').innerText()).toBe('Marcus Feldqvist');
    await expect
      .poll(() => page.getByTestId('overview-schools').innerText())
      .toContain('Heron Point Middle');
    expect(await page.getByTestId('overview-schools').innerText()).not.toContain('Quarry Hill');
    expect(await railLabels(page)).toEqual(expect.arrayContaining(['Overview', 'Schools']));
    await page.evaluate(() => document.fonts.ready);
    await saveScreenshot(page, 'overview-director');
    const fontFamily = await page.evaluate(() => getComputedStyle(document.body).fontFamily);
    expect(fontFamily).toContain('Public Sans');
    const publicSansLoaded = await page.evaluate(() => document.fonts.check('16px "Public Sans"'));
    expect(publicSansLoaded).toBe(true);
    expect(outside).toEqual([]);
    await context.close();
  });

  it('should show the coordinator the whole district', async () => {
    const { context, outside } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('coordinator'));
    await expect
      .poll(() => page.getByTestId('overview-schools').innerText())
      .toContain('Quarry Hill Middle');
    expect(await page.getByTestId('overview-schools').innerText()).toContain('Tamsin Ridge High');
    await saveScreenshot(page, 'overview-coordinator');
    expect(outside).toEqual([]);
    await context.close();
  });

  it('should not offer a student the district overview', async () => {
    const { context } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('student.hpms'));
    await expect.poll(() => page.getByTestId('user-role').innerText()).toBe('Student');
    expect(await railLabels(page)).not.toContain('Overview');
    expect(await railLabels(page)).not.toContain('Schools');
    await context.close();
  });

  it('should send a signed-out visitor to sign in and back to the page they asked for', async () => {
    const { context } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('viewer.trhs'), '/schools');
    await page.waitForURL(`${e2e.app.url}/schools`);
    await expect.poll(() => page.locator('h1').innerText()).toBe('Schools');
    await page.getByRole('button', { name: 'Sign out' }).click();
    await page.getByRole('button', { name: 'Yes, sign me out' }).click();
    await page.waitForURL(/signed-out/);
    await expect.poll(() => page.locator('h1').innerText()).toBe('You are signed out');
    const me = await page.evaluate(async () => (await fetch('/api/me')).status);
    expect(me).toBe(401);
    await context.close();
  });
});
