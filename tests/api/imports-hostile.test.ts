import { describe, expect, it } from 'vitest';
import { toRosterCsv } from '@shared/roster';
import { inventedRoster } from '../bench/roster-import';
import { useTestApp } from '../support/test-app';

const app = useTestApp({ signIn: ['coordinator'] });
const { coordinator } = app.clients;

function preview(file: Buffer) {
  return coordinator.upload('/api/imports/preview', 'file', file, 'roster.csv');
}

/**
 * Sends a preview and, meanwhile, asks for `/api/me` again and again, each ask sent when the
 * last is answered. Answers the preview's answer and the times (ms from the preview's start)
 * at which the other requests were answered, and when the preview was.
 */
async function previewWhileAsking(file: Buffer) {
  const answered: number[] = [];
  const started = performance.now();
  let done = false;
  const asking = (async () => {
    while (!done) {
      const me = await coordinator.get('/api/me');
      expect(me.status).toBe(200);
      answered.push(performance.now() - started);
    }
  })();
  const answer = await preview(file);
  const previewMs = performance.now() - started;
  done = true;
  await asking;
  return { answer, previewMs, during: answered.filter((at) => at < previewMs) };
}

/** The longest time, in the preview's span, in which no other request was answered. */
function longestSilence(during: number[], previewMs: number): number {
  const marks = [0, ...during, previewMs];
  return Math.max(...marks.slice(1).map((at, index) => at - marks[index]!));
}

describe('A hostile or large roster upload', () => {
  it('should refuse a 10 MB file of a million columns with a 400 naming the limit, keeping nothing', async () => {
    const header = 'student_id,first_name,last_name,grade,school_code';
    const file = Buffer.from(`${header}\n${'abcdefghi,'.repeat(1_000_000)}x\n`);
    expect(file.length).toBeGreaterThan(10_000_000);
    const { answer, during } = await previewWhileAsking(file);
    expect(answer.status).toBe(400);
    expect(answer.body.error.message).toMatch(
      /Line 2 has more than 200 columns; a roster file may have at most 200/,
    );
    // Other users were answered while it was read.
    expect(during.length).toBeGreaterThan(0);
    const imports = await coordinator.get('/api/imports');
    expect(imports.body.total).toBe(0);
  });

  it('should refuse a cell of more than 10,000 characters with a 400 naming the limit', async () => {
    const rows = toRosterCsv(inventedRoster(3, 4, 500_000)).split('\r\n');
    rows[2] = rows[2]!.replace(/^([^,]*),/, `$1 ${'y'.repeat(20_000)},`);
    const answer = await preview(Buffer.from(rows.join('\r\n')));
    expect(answer.status).toBe(400);
    expect(answer.body.error.message).toMatch(
      /Line 3, cell 1 holds 20,008 characters; a cell may hold at most 10,000/,
    );
  });

  it('should keep answering other requests all through the preview of a large legitimate file', async () => {
    // 20,000 roster rows, each with 150 more columns a spreadsheet export might carry: ~17 MB
    // of cells to split, far more than the rows to check.
    const roster = toRosterCsv(inventedRoster(20_000, 5, 600_000))
      .trimEnd()
      .split('\r\n');
    const extra = (line: number) =>
      Array.from({ length: 150 }, (_, column) => `x${(line * column) % 9973}`).join(',');
    const file = Buffer.from(
      roster
        .map((line, index) =>
          index === 0
            ? `${line},${Array.from({ length: 150 }, (_, column) => `extra ${column}`).join(',')}`
            : `${line},${extra(index)}`,
        )
        .join('\r\n'),
    );
    expect(file.length).toBeGreaterThan(15_000_000);
    const { answer, previewMs, during } = await previewWhileAsking(file);
    expect(answer.status, JSON.stringify(answer.body).slice(0, 300)).toBe(200);
    expect(answer.body.totalRows).toBe(20_000);
    // Progress, not a speed: other requests were answered all through the preview, never
    // shut out for a quarter of it (splitting the file whole, as papaparse does in one call,
    // shut them out for most of it).
    expect(during.length).toBeGreaterThan(10);
    expect(longestSilence(during, previewMs)).toBeLessThan(previewMs / 4);
  });
});
