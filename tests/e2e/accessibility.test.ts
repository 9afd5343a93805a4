import { describe, expect, it } from 'vitest';
import { AxeBuilder } from '@axe-core/playwright';
import type { Page } from 'playwright-core';
import { demoEmail } from '../support/test-app';
import { useBrowserApp } from '../support/browser-app';
import { localOnlyContext, signInAs } from '../support/browser';

const e2e = useBrowserApp();

/** Waits until a screen has its heading and has finished loading its data. */
async function settled(page: Page) {
  await page.locator('main h1').first().waitFor({ timeout: 30_000 });
  await page.waitForLoadState('networkidle', { timeout: 30_000 });
  await expect
    .poll(() => page.locator('main tb-page-state mat-spinner').count(), { timeout: 30_000 })
    .toBe(0);
}

/**
 * The serious and critical axe violations of the page, as one line each. The rules are axe's
 * WCAG 2.0/2.1 level A and AA tags (axe-core rule descriptions, "Axe Rules" for 4.x), which
 * include color-contrast for WCAG 2.1 AA 1.4.3.
 */
async function seriousViolations(page: Page): Promise<string[]> {
  const analysis = new AxeBuilder({ page })
    .withTags(['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'])
    // Scoped out: the report's mail preview is an iframe with an empty sandbox (no scripts), so
    // axe cannot be injected into it and waits on it forever (rule frame-tested). The page
    // around the frame is still checked.
    .exclude('tb-mail-frame iframe')
    .analyze();
  const results = await Promise.race([
    analysis,
    new Promise<never>((_, reject) =>
      setTimeout(() => reject(new Error(`axe did not finish on ${page.url()}`)), 90_000),
    ),
  ]);
  return results.violations
    .filter((violation) => violation.impact === 'serious' || violation.impact === 'critical')
    .flatMap((violation) =>
      violation.nodes.map(
        (node) =>
          `${violation.id} (${violation.impact}): ${violation.help} at ${node.target.join(' ')} ${node.failureSummary?.replace(/\s+/g, ' ') ?? ''}`,
      ),
    );
}

describe('Accessibility', () => {
  it('should show the coordinator every main screen with no serious or critical axe violation and no blocked script or style', async () => {
    const { context } = await localOnlyContext(e2e.browser);
    // The server's Content-Security-Policy has no inline-script exception; the browser reports
    // anything it blocks as a securitypolicyviolation event (W3C Content Security Policy Level 3).
    await context.addInitScript(() => {
      const blocked: string[] = [];
      (window as unknown as { blockedByPolicy: string[] }).blockedByPolicy = blocked;
      document.addEventListener('securitypolicyviolation', (event) =>
        blocked.push(
          `${event.effectiveDirective} blocked ${event.blockedURI || 'inline code'} at ${event.sourceFile}:${event.lineNumber}:${event.columnNumber}`,
        ),
      );
    });
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('coordinator'));
    await settled(page);
    // Every screen the coordinator's rail offers: the screens that exist in this build.
    const screens = await page
      .locator('nav[aria-label="Main"] a.item')
      .evaluateAll((links) =>
        links.map((link) => new URL((link as HTMLAnchorElement).href).pathname),
      );
    expect(screens).toEqual(
      expect.arrayContaining(['/overview', '/schools', '/students', '/ensembles']),
    );
    const found: string[] = [];
    const blockedByPolicy: string[] = [];
    for (const screen of screens) {
      await page.goto(`${e2e.app.url}${screen}`, { timeout: 30_000 });
      await settled(page);
      // Read before axe runs: axe's own rule code would be blocked by the policy too.
      const blocked = await page.evaluate(
        () => (window as unknown as { blockedByPolicy: string[] }).blockedByPolicy,
      );
      blockedByPolicy.push(...blocked.map((line) => `${screen}: ${line}`));
      const lines = (await seriousViolations(page)).map((line) => `${screen}: ${line}`);
      found.push(...lines);
    }
    expect(found, found.join('\n')).toEqual([]);
    expect(blockedByPolicy).toEqual([]);
    await context.close();
  }, 600_000);

  it('should show a student their own progress page with no serious or critical axe violation', async () => {
    const { context } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('student.hpms'));
    await page.waitForURL(/\/students\/\d+$/);
    await settled(page);
    const found = await seriousViolations(page);
    expect(found, found.join('\n')).toEqual([]);
    await context.close();
  });

  it('should let a keyboard user skip to the content, reach the navigation and see where focus is', async () => {
    const { context } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('coordinator'));
    await settled(page);
    const focused = () =>
      page.evaluate(() => {
        const element = document.activeElement as HTMLElement | null;
        const style = element ? getComputedStyle(element) : undefined;
        return {
          tag: element?.tagName.toLowerCase(),
          text: element?.textContent?.trim(),
          id: element?.id,
          inNavigation: Boolean(element?.closest('nav[aria-label="Main"]')),
          outlineStyle: style?.outlineStyle,
          outlineWidth: style?.outlineWidth,
        };
      });

    // The first Tab lands on the skip link; following it puts focus on the main region.
    await page.evaluate(() => (document.activeElement as HTMLElement | null)?.blur());
    await page.keyboard.press('Tab');
    expect(await focused()).toMatchObject({ tag: 'a', text: 'Skip to content' });
    await page.keyboard.press('Enter');
    await expect.poll(async () => (await focused()).id).toBe('main');

    // Tabbing on from the top reaches the main navigation, and the focused link shows an outline.
    await page.reload();
    await settled(page);
    let reached = await focused();
    for (let presses = 0; presses < 5 && !reached.inNavigation; presses += 1) {
      await page.keyboard.press('Tab');
      reached = await focused();
    }
    expect(reached).toMatchObject({ tag: 'a', inNavigation: true });
    // WCAG 2.1 success criterion 2.4.7 Focus Visible.
    expect(reached.outlineStyle).not.toBe('none');
    expect(reached.outlineWidth).not.toBe('0px');
    await context.close();
  });

  it('should name the Add-instrument dialog, keep heading order, give the ladder editor an h1, and focus the new page’s heading after rail navigation', async () => {
    const { context } = await localOnlyContext(e2e.browser);
    const page = await context.newPage();
    await signInAs(page, e2e.app.url, demoEmail('coordinator'), '/overview');
    await settled(page);
    // axe-core rules heading-order and page-has-heading-one (moderate, so not in the sweep above).
    const headings = async () =>
      (
        await new AxeBuilder({ page })
          .withRules(['heading-order', 'page-has-heading-one', 'aria-dialog-name'])
          .analyze()
      ).violations.map(
        (violation) =>
          `${violation.id}: ${violation.nodes.map((node) => node.target.join(' ')).join(', ')}`,
      );
    expect(await headings()).toEqual([]);

    // A ladder version that is not a draft opens the editor's error state; it still has its h1.
    const coordinator = await e2e.app.signIn(demoEmail('coordinator'));
    const active = (await coordinator.get('/api/ladder')).body as { id: number };
    await page.goto(`${e2e.app.url}/ladder/versions/${active.id}/edit`);
    await page.locator('main tb-page-state').waitFor();
    expect(await headings()).toEqual([]);
    expect(await page.locator('main h1').innerText()).toBe('Edit a draft ladder');

    // axe-core rule aria-dialog-name (serious): the dialog is named by its heading.
    await page.goto(`${e2e.app.url}/instruments`);
    await settled(page);
    await page.getByRole('button', { name: 'Add instrument' }).click();
    await page.locator('mat-dialog-container').waitFor();
    await page.getByTestId('instrument-form').waitFor();
    expect(await headings()).toEqual([]);
    expect(await page.getByRole('dialog', { name: 'New instrument' }).count()).toBe(1);
    await page.keyboard.press('Escape');

    // After following a rail link, focus is on the new page's heading.
    await page.locator('nav[aria-label="Main"] a.item', { hasText: 'Students' }).click();
    await page.waitForURL(`${e2e.app.url}/students`);
    await expect
      .poll(() =>
        page.evaluate(() => {
          const element = document.activeElement;
          return element?.tagName === 'H1' && element.closest('main') !== null
            ? element.textContent?.trim()
            : `not a heading: ${element?.tagName}`;
        }),
      )
      .toBe('Students');
    await context.close();
  }, 180_000);
});
