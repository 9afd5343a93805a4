import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AxeBuilder } from '@axe-core/playwright';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { demoEmail, startTestApp, type TestApp } from '../support/test-app';
import type { EnsembleDetail } from '@shared/api/ensemble';
import type { Ladder, LadderRequirement } from '@shared/api/ladder';
import type { PassOff } from '@shared/api/pass-off';
import type { Student } from '@shared/api/student';
import { findInstrument } from '@shared/music/index';
import { dialogReady, launchBrowser, saveScreenshot, signInAs } from '../support/browser';

let app: TestApp;
let browser: Browser;

beforeAll(async () => {
  [app, browser] = await Promise.all([startTestApp({ serveWeb: true }), launchBrowser()]);
});
afterAll(async () => {
  await browser?.close();
  await app?.close();
});

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

/** Waits until a screen has its heading and has finished loading its data. */
async function settled(page: Page) {
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
function sidewaysOverflow(page: Page): Promise<{ overflow: number; widest: string }> {
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
async function seriousViolations(page: Page): Promise<string[]> {
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

/** The open dialog's box, in whole CSS pixels, once its opening animation has settled. */
function dialogBox(page: Page) {
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

function screenName(path: string): string {
  return (
    path
      .replace(/^\//, '')
      .replace(/\/\d+$/, '')
      .replace(/\//g, '-') || 'start'
  );
}

/** A student the touch entry steps through, with the rung-1 scales asked of their instrument. */
interface TouchStudent {
  id: number;
  name: string;
  asked: LadderRequirement[];
}

describe('Phones and tablets', () => {
  for (const device of devices) {
    it(`should show every screen of every role's navigation at ${device.viewport.width}×${device.viewport.height} with no sideways scroll and no serious axe violation`, async () => {
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

  it('should show the rest of a grid row in a sheet on a phone, open the row from it, and show a dialog full-screen', async () => {
    const context = await browser.newContext({
      viewport: { width: 390, height: 844 },
      deviceScaleFactor: 2,
      isMobile: true,
      hasTouch: true,
      locale: 'en-US',
      timezoneId: 'America/Los_Angeles',
    });
    const page = await context.newPage();
    await signInAs(page, app.url, demoEmail('director.hpms'));
    await page.goto(`${app.url}/students`);
    const firstRow = page.locator('.ag-row[row-index="0"]').first();
    await firstRow.locator('.ag-cell').first().waitFor({ timeout: 30_000 });
    // The phone keeps the key columns the screen marks: last name, first name, grade.
    const headings = await page
      .locator('.ag-header-cell:not(.ag-hidden) .ag-header-cell-text')
      .allInnerTexts();
    expect(headings).toEqual(['Last name', 'First name', 'Grade']);
    const shown = await firstRow.locator('.ag-cell').allInnerTexts();

    await firstRow.locator('.ag-cell').first().tap();
    const sheet = page.locator('mat-bottom-sheet-container');
    await sheet.getByTestId('row-detail-title').waitFor({ timeout: 10_000 });
    const labels = await sheet.locator('dt').allInnerTexts();
    expect(labels).toEqual([
      'Student ID',
      'Preferred',
      'School',
      'Ensembles',
      'Instruments',
      'Status',
    ]);
    const values = await sheet.locator('dd').allInnerTexts();
    const studentNumber = values[0]!;
    // The row the sheet reads out is the student the API has under that number, with the same
    // names the grid's row shows and the school the API gives.
    const director = await app.signIn(demoEmail('director.hpms'));
    const found = (
      await director.get(`/api/students?q=${encodeURIComponent(studentNumber)}&limit=10`)
    ).body.rows as Student[];
    const student = found.find((row) => row.studentNumber === studentNumber);
    expect(student, `student ${studentNumber}`).toBeDefined();
    expect(shown.slice(0, 2)).toEqual([student!.lastName, student!.firstName]);
    expect(await sheet.getByTestId('row-detail-title').innerText()).toBe(
      shown.filter((text) => text.trim() !== '').join(' · '),
    );
    expect(values[2]).toBe(student!.schoolCode);
    const sheetBox = await sheet.boundingBox();
    expect(sheetBox!.width).toBeGreaterThanOrEqual(389);
    expect((await seriousViolations(page)).join('\n')).toBe('');
    await saveScreenshot(page, 'phone-students-row-detail');

    // From the sheet to the student's own page.
    await sheet.getByTestId('row-detail-open').tap();
    await page.waitForURL(new RegExp(`/students/${student!.id}(/|$)`), { timeout: 20_000 });
    await page.locator('main h1').first().waitFor({ timeout: 30_000 });
    await context.clearCookies();

    // A form in a dialog fills the phone (Material Design 3: full-screen dialogs on compact
    // windows): the check-out dialog of the loans screen.
    await signInAs(page, app.url, demoEmail('coordinator'), '/loans');
    await page.getByTestId('check-out').tap();
    await dialogReady(page);
    await expect.poll(() => dialogBox(page)).toEqual({ x: 0, y: 0, width: 390, height: 844 });
    expect((await sidewaysOverflow(page)).overflow).toBeLessThanOrEqual(0);
    await saveScreenshot(page, 'phone-dialog-check-out');
    await context.close();

    // A tablet held upright (a medium window): the columns that fit its width, no sideways
    // scroll inside the grid, and the rest of a row in the same sheet.
    const tablet = await browser.newContext({
      viewport: { width: 820, height: 1180 },
      isMobile: true,
      hasTouch: true,
      locale: 'en-US',
      timezoneId: 'America/Los_Angeles',
    });
    const tabletPage = await tablet.newPage();
    await signInAs(tabletPage, app.url, demoEmail('coordinator'), '/ensembles');
    const tabletRow = tabletPage.locator('.ag-row[row-index="0"]').first();
    await tabletRow.locator('.ag-cell').first().waitFor({ timeout: 30_000 });
    const allHeadings = ['Ensemble', 'School', 'Kind', 'Level', 'Director', 'Meets', 'Members'];
    const tabletHeadings = await tabletPage
      .locator('.ag-header-cell .ag-header-cell-text')
      .allInnerTexts();
    expect(tabletHeadings.length).toBeGreaterThan(3);
    expect(tabletHeadings.length).toBeLessThan(allHeadings.length);
    expect(tabletHeadings).toEqual(allHeadings.slice(0, tabletHeadings.length));
    const frame = await tabletPage.locator('tb-server-grid section.frame').boundingBox();
    const lastHeading = await tabletPage.locator('.ag-header-cell').last().boundingBox();
    expect(lastHeading!.x + lastHeading!.width).toBeLessThanOrEqual(frame!.x + frame!.width + 1);
    await tabletRow.locator('.ag-cell').first().tap();
    const tabletSheet = tabletPage.locator('mat-bottom-sheet-container');
    await tabletSheet.getByTestId('row-detail-title').waitFor({ timeout: 10_000 });
    expect(await tabletSheet.locator('dt').allInnerTexts()).toEqual(
      allHeadings.slice(tabletHeadings.length),
    );
    await saveScreenshot(tabletPage, 'tablet-ensembles-row-detail');
    await tablet.close();
  }, 180_000);

  it('should record pass-offs by touch on a phone, one student at a time, and save each on the server', async () => {
    const director = await app.signIn(demoEmail('director.hpms'));
    const ladder = (await director.get('/api/ladder')).body as Ladder;
    const rungOne = ladder.rungs[0]!.requirements;
    // The first ensemble with three students in a row who play an instrument asked something
    // on rung 1: the students the touch entry steps through, in the ensemble's own order.
    const ensembles = (await director.get('/api/ensembles?limit=100&sort=name:asc')).body.rows as {
      id: number;
    }[];
    let chosen: {
      ensembleId: number;
      students: { id: number; name: string; asked: LadderRequirement[] }[];
    } | null = null;
    for (const { id } of ensembles) {
      const detail = (await director.get(`/api/ensembles/${id}`)).body as EnsembleDetail;
      const seen = new Set<number>();
      const students = detail.members
        .filter(
          (member) => member.active && !seen.has(member.studentId) && seen.add(member.studentId),
        )
        .map((member) => {
          const family = member.instrumentId
            ? findInstrument(member.instrumentId)?.family
            : undefined;
          return {
            id: member.studentId,
            name: `${member.preferredName ?? member.firstName} ${member.lastName}`,
            asked: rungOne.filter(
              (requirement) =>
                !requirement.families ||
                (family !== undefined && (requirement.families as string[]).includes(family)),
            ),
          };
        });
      if (
        students.length >= 3 &&
        students.slice(0, 3).every((student) => student.asked.length >= 2)
      ) {
        chosen = { ensembleId: id, students: students.slice(0, 3) };
        break;
      }
    }
    expect(chosen, 'a Heron Point ensemble with three students asked rung 1').not.toBeNull();
    const [first, second, third] = chosen!.students as [TouchStudent, TouchStudent, TouchStudent];
    const before = new Map<number, number>();
    for (const student of chosen!.students) {
      const rows = (await director.get(`/api/pass-offs?studentId=${student.id}&limit=1000`)).body
        .rows as PassOff[];
      before.set(student.id, rows.length);
    }

    const context = await browser.newContext({
      viewport: { width: 390, height: 844 },
      deviceScaleFactor: 2,
      isMobile: true,
      hasTouch: true,
      locale: 'en-US',
      timezoneId: 'America/Los_Angeles',
    });
    const page = await context.newPage();
    await signInAs(page, app.url, demoEmail('director.hpms'));
    await page.goto(`${app.url}/pass-offs?ensemble=${chosen!.ensembleId}&rung=1`);
    const name = page.getByTestId('touch-student-name');
    await expect.poll(() => name.innerText(), { timeout: 30_000 }).toBe(first.name);
    const scale = (requirement: LadderRequirement) =>
      page.locator(`[data-testid="touch-scale"][data-code="${requirement.code}"]`);

    // WCAG 2.2 success criterion 2.5.8 asks 24 px; Material Design's touch target is 48 × 48 dp.
    const targets = await scale(first.asked[0]!)
      .locator('button')
      .evaluateAll((buttons) => buttons.map((button) => button.getBoundingClientRect()))
      .then((boxes) => boxes.map((box) => Math.min(box.width, box.height)));
    expect(Math.min(...targets)).toBeGreaterThanOrEqual(48);

    // First student: the first scale passed at a preset under tempo, the second not yet.
    const slower = first.asked[0]!.tempo - 8;
    await scale(first.asked[0]!)
      .getByRole('button', { name: `♩ ${slower}`, exact: true })
      .tap();
    await scale(first.asked[0]!)
      .getByRole('button', { name: /^Passed/ })
      .tap();
    await scale(first.asked[1]!)
      .getByRole('button', { name: /^Not yet/ })
      .tap();
    await expect
      .poll(() => scale(first.asked[0]!).getByTestId('touch-state').innerText(), {
        timeout: 20_000,
      })
      .toMatch(new RegExp(`^Passed at ♩ = ${slower} · (Waiting to send|Sending…|Saved)`));
    await saveScreenshot(page, 'phone-pass-offs-touch');

    // Next student with the button; a tempo typed on the number pad.
    await page.getByTestId('touch-next').tap();
    await expect.poll(() => name.innerText()).toBe(second.name);
    await scale(second.asked[0]!).getByRole('button', { name: 'Other…' }).tap();
    for (const key of ['9', '7', 'Use']) {
      await scale(second.asked[0]!).getByRole('button', { name: key, exact: true }).tap();
    }
    await scale(second.asked[0]!)
      .getByRole('button', { name: /^Passed/ })
      .tap();

    // Next student with a swipe to the left (touch events through the DevTools protocol).
    const session = await context.newCDPSession(page);
    const y = 500;
    await session.send('Input.dispatchTouchEvent', {
      type: 'touchStart',
      touchPoints: [{ x: 320, y }],
    });
    await session.send('Input.dispatchTouchEvent', {
      type: 'touchMove',
      touchPoints: [{ x: 200, y }],
    });
    await session.send('Input.dispatchTouchEvent', {
      type: 'touchMove',
      touchPoints: [{ x: 80, y }],
    });
    await session.send('Input.dispatchTouchEvent', { type: 'touchEnd', touchPoints: [] });
    await expect.poll(() => name.innerText()).toBe(third.name);

    // The scale's side panel in a full-screen sheet: the requirement, a note written before the
    // result (it goes out with the entry), the director's own take, what was heard before.
    await scale(third.asked[0]!).getByTestId('touch-details').tap();
    const panel = page.getByTestId('touch-panel');
    await panel.getByTestId('cell-panel').waitFor({ timeout: 10_000 });
    await dialogReady(page);
    expect(await panel.locator('#cell-panel-title').innerText()).toBe(third.name);
    expect(await panel.locator('tb-director-take').count()).toBe(1);
    expect(await panel.getByRole('heading', { name: 'Heard before' }).count()).toBe(1);
    await expect.poll(() => dialogBox(page)).toEqual({ x: 0, y: 0, width: 390, height: 844 });
    const note = 'Even sixteenths on the way down';
    await panel.getByTestId('cell-note').fill(note);
    await saveScreenshot(page, 'phone-pass-offs-touch-panel');
    await panel.getByRole('button', { name: 'Close', exact: true }).tap();
    await panel.waitFor({ state: 'detached' });
    await scale(third.asked[0]!)
      .getByRole('button', { name: /^Passed/ })
      .tap();

    // The card's state first (the queue line may still read as it did before the tap).
    await expect
      .poll(() => scale(third.asked[0]!).getByTestId('touch-state').innerText(), {
        timeout: 30_000,
      })
      .toBe(`Passed at ♩ = ${third.asked[0]!.tempo} · Saved`);
    await expect
      .poll(() => page.getByTestId('touch-queue').innerText(), { timeout: 30_000 })
      .toContain('All entries saved');
    const { overflow, widest } = await sidewaysOverflow(page);
    expect(overflow, widest).toBeLessThanOrEqual(0);

    // On the server: exactly the four entries, each once, each with the key the queue gave it.
    const recorded = async (studentId: number) =>
      (
        (await director.get(`/api/pass-offs?studentId=${studentId}&limit=1000`)).body
          .rows as PassOff[]
      )
        .slice(0, undefined)
        .filter((passOff) => passOff.clientKey !== null);
    const firstRows = await recorded(first.id);
    const secondRows = await recorded(second.id);
    const thirdRows = await recorded(third.id);
    const summary = (rows: PassOff[]) =>
      rows.map((row) => `${row.requirementCode} ${row.tempo} ${row.passed}`).sort();
    expect(summary(firstRows)).toEqual(
      [
        `${first.asked[0]!.code} ${slower} true`,
        `${first.asked[1]!.code} ${first.asked[1]!.tempo} false`,
      ].sort(),
    );
    expect(summary(secondRows)).toEqual([`${second.asked[0]!.code} 97 true`]);
    expect(summary(thirdRows)).toEqual([`${third.asked[0]!.code} ${third.asked[0]!.tempo} true`]);
    expect(thirdRows.map((row) => row.note)).toEqual([note]);
    expect(firstRows.every((row) => row.note === '')).toBe(true);
    const total = async (studentId: number) =>
      (
        (await director.get(`/api/pass-offs?studentId=${studentId}&limit=1000`)).body
          .rows as PassOff[]
      ).length;
    expect(await total(first.id)).toBe(before.get(first.id)! + 2);
    expect(await total(second.id)).toBe(before.get(second.id)! + 1);
    expect(await total(third.id)).toBe(before.get(third.id)! + 1);

    // A practice sheet on the same phone: the staff wraps to the screen at the size it has on a
    // desktop, and play, tempo and print sit in the bar at the bottom of the window.
    await page.goto(
      `${app.url}/practice?tonic=Bb&mode=major&pattern=cycle-broad&tempo=100&instrument=clarinet`,
    );
    const staff = page.getByTestId('sheet-staff');
    await staff.locator('[role=img][data-notes]').waitFor({ timeout: 30_000 });
    const drawn = await staff.locator('svg').evaluate((svg) => ({
      shown: svg.getBoundingClientRect().width,
      drawn: (svg as SVGSVGElement).viewBox.baseVal.width,
      right: svg.getBoundingClientRect().right,
    }));
    expect(drawn.right).toBeLessThanOrEqual(390);
    // Drawn at the box's own width: one drawing unit to one CSS pixel, not a 1,000-unit staff
    // shrunk to a third.
    expect(drawn.shown / drawn.drawn).toBeGreaterThan(0.95);
    await staff.scrollIntoViewIfNeeded();
    const bar = page.getByRole('toolbar', { name: 'Play, tempo and print' });
    for (const name of [/^(Play|Loading…)/, /^Slower$/, /^Faster$/, /^Print$/]) {
      const box = await bar.getByRole('button', { name }).boundingBox();
      expect(box, String(name)).not.toBeNull();
      // Within the window's bottom fifth, where a thumb reaches (common practice, no source).
      expect(box!.y + box!.height).toBeLessThanOrEqual(844);
      expect(box!.y).toBeGreaterThan(844 * 0.8);
    }
    const scrolledTo = await page.evaluate(() => window.scrollY);
    expect(scrolledTo).toBeGreaterThan(0);
    await bar.getByRole('button', { name: 'Faster' }).tap();
    await expect.poll(() => page.getByTestId('thumb-tempo').innerText()).toBe('♩ = 104');
    await staff.locator('[role=img][data-notes]').waitFor({ timeout: 30_000 });
    // The tap keeps the staff where the reader had it (the router would scroll to the top).
    await expect.poll(() => page.evaluate(() => window.scrollY)).toBe(scrolledTo);
    expect((await sidewaysOverflow(page)).overflow).toBeLessThanOrEqual(0);
    await saveScreenshot(page, 'phone-practice-sheet');
    await context.close();

    // A tablet held sideways: the icon rail beside the page, and the touch entry in two columns.
    const tablet = await browser.newContext({
      viewport: { width: 1180, height: 820 },
      isMobile: true,
      hasTouch: true,
      locale: 'en-US',
      timezoneId: 'America/Los_Angeles',
    });
    const tabletPage = await tablet.newPage();
    await signInAs(tabletPage, app.url, demoEmail('director.hpms'));
    await tabletPage.goto(`${app.url}/pass-offs?ensemble=${chosen!.ensembleId}&rung=1`);
    await expect
      .poll(() => tabletPage.getByTestId('touch-student-name').innerText(), { timeout: 30_000 })
      .toBe(first.name);
    const rail = await tabletPage.locator('nav[aria-label="Main"]').boundingBox();
    expect(rail!.width).toBeLessThan(120);
    expect(await tabletPage.getByTestId('menu-button').isVisible()).toBe(false);
    expect((await sidewaysOverflow(tabletPage)).overflow).toBeLessThanOrEqual(0);
    await saveScreenshot(tabletPage, 'tablet-landscape-pass-offs-touch');

    // On the tablet the same panel is a side sheet at the window's right edge, the page beside it.
    await tabletPage.locator('[data-testid="touch-details"]').first().tap();
    await tabletPage.getByTestId('cell-panel').waitFor({ timeout: 10_000 });
    await dialogReady(tabletPage);
    await expect
      .poll(() => dialogBox(tabletPage))
      .toEqual({ x: 1180 - 440, y: 0, width: 440, height: 820 });
    await saveScreenshot(tabletPage, 'tablet-landscape-pass-offs-touch-panel');
    await tablet.close();
  }, 240_000);
});
