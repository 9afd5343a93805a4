import { describe, expect, it } from 'vitest';
import type { BrowserContext, Page } from 'playwright-core';
import { demoEmail } from '../support/test-app';
import { saveScreenshot, signInAs } from '../support/browser';
import { seriousViolations, settled, sidewaysOverflow, useSmallScreens } from './small-screens-app';

const started = useSmallScreens();

/**
 * The two devices the screens are checked on, in CSS pixels: a 6.1-inch phone (390 × 844) and
 * an 11-inch tablet held upright (820 × 1180). From memory of the devices' published sizes.
 */
const devices = [
  { name: 'phone', viewport: { width: 390, height: 844 } },
  { name: 'tablet', viewport: { width: 820, height: 1180 } },
] as const;

/** Every demo role, in the order their navigation is walked. */
const roles = [
  'coordinator',
  'director.hpms',
  'technician',
  'viewer.trhs',
  'student.hpms',
] as const;

/** Opens the menu's drawer and reads the paths of the links in it. */
async function drawerScreens(page: Page): Promise<string[]> {
  await page.getByTestId('menu-button').click();
  const drawer = page.getByTestId('navigation-drawer');
  await drawer.locator('a.item').first().waitFor({ state: 'visible' });
  const paths = await drawer
    .locator('a.item')
    .evaluateAll((links) =>
      links.map((link) => new URL((link as HTMLAnchorElement).href).pathname),
    );
  await page.keyboard.press('Escape');
  await drawer.locator('a.item').first().waitFor({ state: 'hidden' });
  return paths;
}

/** The paths of the rail's links (a tablet's width shows the rail or the menu). */
async function navigationScreens(page: Page, device: string): Promise<string[]> {
  if (device === 'phone' || (await page.getByTestId('menu-button').isVisible()))
    return drawerScreens(page);
  return page
    .locator('nav[aria-label="Main"] a.item')
    .evaluateAll((links) =>
      links.map((link) => new URL((link as HTMLAnchorElement).href).pathname),
    );
}

function screenName(path: string): string {
  return (
    path
      .replace(/^\//, '')
      .replace(/\/\d+$/, '')
      .replace(/\//g, '-') || 'start'
  );
}

describe('Phones and tablets', () => {
  for (const device of devices) {
    it(`should show every screen of every role's navigation at ${device.viewport.width}×${device.viewport.height} with no sideways scroll and no serious axe violation`, async () => {
      const { app, browser } = started;
      const context: BrowserContext = await browser.newContext({
        viewport: device.viewport,
        deviceScaleFactor: 1,
        hasTouch: true,
        locale: 'en-US',
        timezoneId: 'America/Los_Angeles',
      });
      const page = await context.newPage();
      const problems: string[] = [];
      const visited = new Set<string>();
      for (const role of roles) {
        await context.clearCookies();
        await signInAs(page, app.url, demoEmail(role));
        await settled(page);
        const screens = await navigationScreens(page, device.name);
        expect(screens.length, `${role} has a navigation`).toBeGreaterThan(0);
        // A student's own page is their start page, not a navigation entry.
        if (role === 'student.hpms') screens.unshift(new URL(page.url()).pathname);
        for (const screen of screens) {
          // Screens that look the same for every role are checked once, with the first role
          // that has them; the student's screens show their own data and are all checked.
          const key = role === 'student.hpms' ? `student:${screen}` : screen;
          if (visited.has(key)) continue;
          visited.add(key);
          await page.goto(`${app.url}${screen}`, { timeout: 30_000 });
          await settled(page);
          const { overflow, widest } = await sidewaysOverflow(page);
          if (overflow > 0)
            problems.push(`${role} ${screen}: the page scrolls ${overflow} px sideways; ${widest}`);
          problems.push(
            ...(await seriousViolations(page)).map((line) => `${role} ${screen}: ${line}`),
          );
          const who = role === 'student.hpms' ? 'student-' : '';
          await saveScreenshot(page, `${device.name}-${who}${screenName(screen)}`);
        }
      }
      expect(problems, problems.join('\n')).toEqual([]);
      await context.close();
    }, 900_000);
  }
});
