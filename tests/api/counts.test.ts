import { describe, expect, it } from 'vitest';
import { countDetailSchema } from '@shared/api/count';
import { useTestApp } from '../support/test-app';

const app = useTestApp({ signIn: ['coordinator', 'director.hpms', 'viewer.trhs'] });
const { coordinator, 'director.hpms': director, 'viewer.trhs': viewer } = app.clients;

describe('Counts', () => {
  it('should reconcile scans and mark what was not found missing on close', async () => {
    expect((await director.post('/api/counts', { schoolId: app.schoolIds['QHMS'] })).status).toBe(
      404,
    );
    expect((await viewer.post('/api/counts', { schoolId: app.schoolIds['TRHS'] })).status).toBe(
      403,
    );
    const started = await director.post('/api/counts', { schoolId: app.schoolIds['HPMS'] });
    expect(started.status).toBe(201);
    const countId = started.body.id;
    expect((await director.post('/api/counts', { schoolId: app.schoolIds['HPMS'] })).status).toBe(
      409,
    );
    const shelf = (
      await coordinator.get(
        `/api/instruments?homeSchoolId=${app.schoolIds['HPMS']}&status=available&limit=1000`,
      )
    ).body.rows;
    const [notScanned, ...scanned] = shelf as { id: number; assetTag: string }[];
    for (const instrument of scanned) {
      const scan = await director.post(`/api/counts/${countId}/scans`, {
        assetTag: instrument.assetTag.toLowerCase(),
      });
      expect(scan.body.outcome).toBe('found');
    }
    const visitor = (
      await coordinator.get(
        `/api/instruments?homeSchoolId=${app.schoolIds['QHMS']}&status=available&limit=1`,
      )
    ).body.rows[0];
    expect(
      (await director.post(`/api/counts/${countId}/scans`, { assetTag: visitor.assetTag })).body
        .outcome,
    ).toBe('found-elsewhere');
    expect(
      (await director.post(`/api/counts/${countId}/scans`, { assetTag: 'NO-SUCH-TAG' })).body
        .outcome,
    ).toBe('unknown');
    expect(
      (await director.post(`/api/counts/${countId}/scans`, { assetTag: scanned[0]!.assetTag })).body
        .outcome,
    ).toBe('duplicate');
    const detail = countDetailSchema.parse((await director.get(`/api/counts/${countId}`)).body);
    expect(detail.reconciliation.found.map((row) => row.id).sort()).toEqual(
      scanned.map((row) => row.id).sort(),
    );
    expect(detail.reconciliation.foundElsewhere.map((row) => row.assetTag)).toEqual([
      visitor.assetTag,
    ]);
    expect(detail.reconciliation.unknownTags).toEqual(['NO-SUCH-TAG']);
    expect(detail.reconciliation.notFound.map((row) => row.id)).toContain(notScanned!.id);
    expect(detail.reconciliation.onLoan.length).toBeGreaterThan(0);
    const closed = await director.post(`/api/counts/${countId}/close`, { confirmMissing: true });
    expect(closed.status).toBe(200);
    expect(closed.body.state).toBe('closed');
    const missing = await coordinator.get(`/api/instruments/${notScanned!.id}`);
    expect(missing.body.status).toBe('missing');
    expect(missing.body.timeline[0]).toMatchObject({ kind: 'marked-missing', countId });
    expect((await coordinator.get(`/api/instruments/${scanned[0]!.id}`)).body.status).toBe(
      'available',
    );
    expect(
      (await director.post(`/api/counts/${countId}/scans`, { assetTag: scanned[0]!.assetTag }))
        .status,
    ).toBe(409);
  });

  it('should list the closed demo count at Tamsin Ridge to its viewer only', async () => {
    const seen = await viewer.get('/api/counts');
    expect(
      seen.body.rows.map(
        (row: { schoolCode: string; state: string }) => `${row.schoolCode}:${row.state}`,
      ),
    ).toEqual(['TRHS:closed']);
    const detail = await viewer.get(`/api/counts/${seen.body.rows[0].id}`);
    expect(detail.body.reconciliation.unknownTags).toHaveLength(1);
    expect((await director.get(`/api/counts/${seen.body.rows[0].id}`)).status).toBe(404);
  });
});
