import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { inflateSync } from 'node:zlib';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { startOidcFake, type OidcFake } from '../../fakes/oidc/index';
import { startMailFake, type MailFake } from '../../fakes/mail/index';
import { runTutti } from '../support/cli';
import { startServerProcess, type ServerProcess } from '../support/server-process';
import { chooseOption, launchBrowser, localOnlyContext, saveScreenshot } from '../support/browser';

const coordinatorEmail = 'music.office@kestrel.example';
const logoFile = path.resolve('tests/fixtures/logos/band.png');
const outputFolder = path.resolve('tests/output');

let dataDir: string;
let oidc: OidcFake;
let mail: MailFake;
let server: ServerProcess;
let browser: Browser;

/**
 * The text a PDF shows, in page order: pdfkit writes each run of text as hex strings inside its
 * (Flate-compressed) content streams (ISO 32000-1, 7.3.4.3 and 9.4.3). Kerning numbers between
 * the strings are left out, so words come out whole.
 */
function pdfText(pdf: Buffer): string {
  const source = pdf.toString('latin1');
  let text = '';
  for (const match of source.matchAll(/stream\r?\n/g)) {
    const start = match.index + match[0].length;
    const end = source.indexOf('endstream', start);
    let content: string;
    try {
      content = inflateSync(pdf.subarray(start, end)).toString('latin1');
    } catch {
      continue;
    }
    // Inside a content stream, <…> is only ever a hex string (dictionaries are << … >>).
    for (const hex of content.matchAll(/<([0-9a-fA-F\s]+)>/g)) {
      text += Buffer.from(hex[1]!.replace(/\s/g, ''), 'hex').toString('latin1');
    }
    text += '\n';
  }
  return text;
}

/** The pixel sizes of the images a PDF holds (ISO 32000-1, 8.9.5: image XObject dictionaries). */
function pdfImageSizes(pdf: Buffer): string[] {
  const source = pdf.toString('latin1');
  return [...source.matchAll(/<<[^>]*\/Subtype \/Image[^>]*>>/g)].map((dictionary) => {
    const width = /\/Width (\d+)/.exec(dictionary[0])?.[1];
    const height = /\/Height (\d+)/.exec(dictionary[0])?.[1];
    return `${width}x${height}`;
  });
}

async function api(token: string, method: string, target: string, body?: object) {
  const response = await fetch(`${server.url}${target}`, {
    method,
    headers: { Authorization: `Bearer ${token}`, 'content-type': 'application/json' },
    body: body ? JSON.stringify(body) : undefined,
  });
  return response;
}

beforeAll(async () => {
  dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'tutti-kestrel-'));
  fs.mkdirSync(outputFolder, { recursive: true });
  [oidc, mail, browser] = await Promise.all([
    startOidcFake({ port: 0, acceptTypedEmails: true }),
    startMailFake({ smtpPort: 0, httpPort: 0 }),
    launchBrowser(),
  ]);
});
afterAll(async () => {
  await server?.stop();
  await browser?.close();
  await Promise.all([oidc?.close(), mail?.close()]);
  fs.rmSync(dataDir, { recursive: true, force: true });
});

describe('A new district adopts Tuttiboard', () => {
  it('should set up Kestrel Valley Schools, sign its coordinator in, add a school and a logo, and print both', async () => {
    const setup = await runTutti(
      [
        'setup',
        '--district',
        'Kestrel Valley Schools',
        '--coordinator',
        coordinatorEmail,
        '--time-zone',
        'America/Denver',
      ],
      { TUTTI_DATA_DIR: dataDir, DATABASE_URL: undefined },
    );
    expect(setup.code, setup.stderr).toBe(0);
    expect(setup.stdout).toContain('Set up Kestrel Valley Schools');

    server = await startServerProcess(dataDir, {
      OIDC_ISSUER: oidc.issuer,
      SMTP_URL: mail.smtpUrl,
    });
    const { context, outside } = await localOnlyContext(browser);
    const page = await context.newPage();

    // The district's own provider knows its coordinator: typed on the sign-in page.
    await page.goto(`${server.url}/`);
    await page.locator('#sign-in-form input[name="email"]').fill(coordinatorEmail);
    await page.locator('#sign-in-form button[type="submit"]').click();
    await page.waitForURL((url) => url.origin === server.url && !url.pathname.startsWith('/auth'));
    await expect
      .poll(() => page.getByTestId('district-name').innerText(), { timeout: 30_000 })
      .toBe('Kestrel Valley Schools');
    await expect
      .poll(() => page.getByTestId('first-day-guide').innerText(), { timeout: 30_000 })
      .toContain('Add the schools');
    expect(await page.locator('[data-step="schools"] mat-icon').getAttribute('aria-label')).toBe(
      'To do',
    );
    await page.evaluate(() => document.fonts.ready);
    await saveScreenshot(page, 'district-first-day');

    // A school by hand.
    await page.goto(`${server.url}/schools/new`);
    await page.getByLabel('Code').fill('KVMS');
    await page.getByLabel('Name', { exact: true }).fill('Kestrel Valley Middle');
    await chooseOption(page, 'lowest-grade', '6');
    await chooseOption(page, 'highest-grade', '8');
    await page.getByRole('button', { name: 'Add school' }).click();
    await page.waitForURL(/\/schools\/\d+$/);
    await expect
      .poll(() => page.locator('h1').innerText(), { timeout: 30_000 })
      .toBe('Kestrel Valley Middle');
    await page.goto(`${server.url}/schools`);
    const cell = (colId: string) =>
      page.locator(`[role=row][row-index="0"] [role=gridcell][col-id="${colId}"]`);
    await expect
      .poll(() => cell('name').innerText(), { timeout: 30_000 })
      .toBe('Kestrel Valley Middle');
    expect(await cell('grades').innerText()).toBe('6–8');
    expect(await cell('closedOn').innerText()).toBe('Open');
    await saveScreenshot(page, 'district-schools');

    // The logo, on the District settings screen under Administration.
    await page.locator('nav[aria-label="Main"] a.item', { hasText: 'District settings' }).click();
    await page.waitForURL(`${server.url}/district`);
    await page.getByLabel('Phone').fill('(555) 014-2200');
    await page.getByRole('button', { name: 'Save settings' }).click();
    await expect
      .poll(() => page.locator('span.saved').innerText(), { timeout: 30_000 })
      .toBe('Saved.');
    await page.getByTestId('logo-file').setInputFiles(logoFile);
    await expect.poll(() => page.getByTestId('district-logo').count(), { timeout: 30_000 }).toBe(1);
    const logoBox = await page.getByTestId('district-logo').boundingBox();
    expect(logoBox!.height).toBeLessThanOrEqual(40);
    await saveScreenshot(page, 'district-settings');

    // An instrument of the new school, lent to a student, the agreement signed by the guardian.
    const token = (
      await runTutti(['token', coordinatorEmail], {
        TUTTI_DATA_DIR: dataDir,
        DATABASE_URL: undefined,
      })
    ).stdout
      .trim()
      .split('\n')
      .pop()!;
    const schools = (await (await api(token, 'GET', '/api/schools?code=KVMS')).json()) as {
      rows: { id: number }[];
    };
    const schoolId = schools.rows[0]!.id;
    const instrument = await api(token, 'POST', '/api/instruments', {
      assetTag: 'KV-TPT-001',
      instrumentId: 'trumpet',
      homeSchoolId: schoolId,
    });
    expect(instrument.status).toBe(201);
    const student = await api(token, 'POST', '/api/students', {
      studentNumber: 'KV1001',
      firstName: 'Wren',
      lastName: 'Halloway',
      grade: 6,
      schoolId,
      guardianName: 'Ivo Halloway',
      guardianEmail: 'ivo.halloway@kestrel.example',
    });
    expect(student.status).toBe(201);
    const loan = await api(token, 'POST', '/api/loans', {
      instrumentId: ((await instrument.json()) as { id: number }).id,
      studentId: ((await student.json()) as { id: number }).id,
      conditionOut: 'good',
    });
    expect(loan.status).toBe(201);
    const loanId = ((await loan.json()) as { id: number }).id;
    await expect.poll(() => mail.messages().length, { timeout: 30_000 }).toBeGreaterThan(0);
    const message = mail.messages()[0]!;
    expect(message.from).toContain('Kestrel Valley Schools');
    const link = /https?:\/\/\S+\/agreements\/[A-Za-z0-9_-]+/.exec(message.text ?? '')![0];
    await page.goto(link.replace(/^https?:\/\/[^/]+/, server.url));
    expect(await page.locator('.brand').textContent()).toContain('Kestrel Valley Schools');
    expect(await page.locator('.brand img').count()).toBe(1);
    await saveScreenshot(page, 'district-agreement-page');
    await page.getByLabel('Your full name').fill('Ivo Halloway');
    await page.getByRole('checkbox').check();
    await page.getByRole('button', { name: 'Sign the agreement' }).click();
    await expect
      .poll(() => page.locator('h1').innerText(), { timeout: 30_000 })
      .toContain('the agreement is signed');

    const agreement = await api(token, 'GET', `/api/loans/${loanId}/agreement.pdf`);
    expect(agreement.headers.get('content-disposition')).toContain(
      'kestrel-valley-schools-loan-agreement',
    );
    const agreementPdf = Buffer.from(await agreement.arrayBuffer());
    fs.writeFileSync(path.join(outputFolder, 'kestrel-agreement.pdf'), agreementPdf);
    expect(pdfText(agreementPdf)).toContain('Kestrel Valley Schools');
    expect(pdfText(agreementPdf)).toContain('(555) 014-2200');
    // The logo is the only image on the agreement: band.png is 96 × 48 pixels.
    expect(pdfImageSizes(agreementPdf)).toContain('96x48');

    const labels = await api(token, 'GET', `/api/instruments/labels.pdf?schoolId=${schoolId}`);
    const labelsPdf = Buffer.from(await labels.arrayBuffer());
    fs.writeFileSync(path.join(outputFolder, 'kestrel-labels.pdf'), labelsPdf);
    const labelText = pdfText(labelsPdf);
    expect(labelText).toContain('KV-TPT-001');
    expect(labelText).toContain('KVMS · Kestrel Valley Schools property');
    expect(pdfImageSizes(labelsPdf)).toContain('96x48');
    expect(labelText).not.toMatch(/merrow/i);
    expect(pdfText(agreementPdf)).not.toMatch(/merrow/i);

    expect(outside).toEqual([]);
    await context.close();
    // Several tutti runs and a server process on a shared machine: more than the suite's default.
  }, 600_000);
});
