import { afterAll, beforeAll, expect } from 'vitest';
import { AxeBuilder } from '@axe-core/playwright';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { startTestApp, type TestApp } from '../support/test-app';
import { launchBrowser } from '../support/browser';

/**
 * The demo district served with the web build and a browser, started before a small-screens
 * test file and closed after it.
 */
export function useSmallScreens() {
  const started = {} as { app: TestApp; browser: Browser };
  beforeAll(async () => {
    [started.app, started.browser] = await Promise.all([
      startTestApp({ serveWeb: true }),
      launchBrowser(),
    ]);
  });
  afterAll(async () => {
    await started.browser?.close();
    await started.app?.close();
  });
  return started;
}

/** A touch device's browser context: a phone or tablet window in CSS pixels, US English, Pacific time. */
export function touchContext(
  browser: Browser,
  viewport: { width: number; height: number },
  deviceScaleFactor?: number,
  serviceWorkers: 'allow' | 'block' = 'allow',
): Promise<BrowserContext> {
  return browser.newContext({
    viewport,
    serviceWorkers,
    ...(deviceScaleFactor ? { deviceScaleFactor } : {}),
    isMobile: true,
    hasTouch: true,
    locale: 'en-US',
    timezoneId: 'America/Los_Angeles',
  });
}

/** Waits until a screen has its heading and has finished loading its data. */
export async function settled(page: Page) {
  await page.locator('main h1').first().waitFor({ timeout: 30_000 });
  await page.waitForLoadState('networkidle', { timeout: 30_000 });
  await expect
    .poll(() => page.locator('main tb-page-state mat-spinner').count(), { timeout: 30_000 })
    .toBe(0);
  await page.evaluate(() => document.fonts.ready);
}

/**
 * How far the page reaches past the window's right edge, in CSS pixels (0 when nothing scrolls
 * sideways). A grid that scrolls inside its own box does not count: only the document's.
 */
export function sidewaysOverflow(page: Page): Promise<{ overflow: number; widest: string }> {
  return page.evaluate(() => {
    const scroller = document.scrollingElement!;
    const overflow = scroller.scrollWidth - window.innerWidth;
    let widest = '';
    if (overflow > 0) {
      // Name the element that sticks out furthest, so a failure says where to look.
      let right = window.innerWidth;
      for (const element of Array.from(document.querySelectorAll('main *'))) {
        const box = element.getBoundingClientRect();
        if (box.right > right + 0.5 && box.width > 0) {
          right = box.right;
          widest = `${element.tagName.toLowerCase()}.${Array.from(element.classList).join('.')} (${Math.round(box.right)} px)`;
        }
      }
    }
    return { overflow, widest };
  });
}

/**
 * The serious and critical axe violations of the page, as one line each, with the same rules as
 * the desktop sweep (axe-core WCAG 2.0/2.1 A and AA tags).
 */
export async function seriousViolations(page: Page): Promise<string[]> {
  const results = await new AxeBuilder({ page })
    .withTags(['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'])
    .exclude('tb-mail-frame iframe')
    .analyze();
  return results.violations
    .filter((violation) => violation.impact === 'serious' || violation.impact === 'critical')
    .flatMap((violation) =>
      violation.nodes.map(
        (node) =>
          `${violation.id} (${violation.impact}): ${violation.help} at ${node.target.join(' ')}`,
      ),
    );
}

/** The open dialog's box, in whole CSS pixels, once its opening animation has settled. */
export function dialogBox(page: Page) {
  return page
    .locator('.mat-mdc-dialog-surface')
    .boundingBox()
    .then((box) =>
      box
        ? {
            x: Math.round(box.x),
            y: Math.round(box.y),
            width: Math.round(box.width),
            height: Math.round(box.height),
          }
        : null,
    );
}
