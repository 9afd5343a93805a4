import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { useTestApp, type SignedInClient } from '../support/test-app';

const layout = {
  columns: [
    { colId: 'lastName', width: 180 },
    { colId: 'firstName', width: 140 },
    { colId: 'guardianEmail', hide: true },
  ],
  sort: 'lastName:asc',
};

// The shared test client has no PUT: send one with the same cookie and same-site Origin.
function put(client: SignedInClient, path: string, body: object) {
  return request(app.url).put(path).set({ Cookie: client.cookie, Origin: app.url }).send(body);
}

const app = useTestApp({
  signIn: ['director.hpms', 'director.qhms', 'student.hpms'],
});
const {
  'director.hpms': director,
  'director.qhms': otherDirector,
  'student.hpms': student,
} = app.clients;

describe('Grid preferences', () => {
  it('should keep each user’s own layout of a grid', async () => {
    const empty = await director.get('/api/grid-preferences/students');
    expect(empty.status).toBe(200);
    expect(empty.body).toEqual({ grid: 'students', state: null, updatedAt: null });
    const saved = await put(director, '/api/grid-preferences/students', { state: layout });
    expect(saved.status).toBe(200);
    expect(saved.body.state).toEqual(layout);
    expect((await director.get('/api/grid-preferences/students')).body.state).toEqual(layout);
    expect((await otherDirector.get('/api/grid-preferences/students')).body.state).toBeNull();
    const changed = { columns: [{ colId: 'grade', width: 60 }] };
    await put(director, '/api/grid-preferences/students', { state: changed });
    expect((await director.get('/api/grid-preferences/students')).body.state).toEqual(changed);
    expect((await director.get('/api/grid-preferences/ensembles')).body.state).toBeNull();
    expect((await put(student, '/api/grid-preferences/practice', { state: changed })).status).toBe(
      200,
    );
    expect((await director.delete('/api/grid-preferences/students')).status).toBe(204);
    expect((await director.get('/api/grid-preferences/students')).body.state).toBeNull();
  });

  it('should answer 400 for a malformed or oversized layout and keep the old one', async () => {
    await put(director, '/api/grid-preferences/ensembles', { state: layout });
    const malformed = await put(director, '/api/grid-preferences/ensembles', {
      state: { columns: [{ width: 'wide' }] },
    });
    expect(malformed.status).toBe(400);
    const oversized = {
      columns: Array.from({ length: 200 }, (_, index) => ({
        colId: `column-${index}-${'x'.repeat(80)}`,
        width: 100,
      })),
    };
    const tooBig = await put(director, '/api/grid-preferences/ensembles', { state: oversized });
    expect(tooBig.status).toBe(400);
    expect(tooBig.body.error.fieldErrors).toEqual([
      { field: 'state', message: expect.stringMatching(/bytes/) },
    ]);
    expect((await director.get('/api/grid-preferences/Bad_Name!')).status).toBe(400);
    expect((await director.get('/api/grid-preferences/ensembles')).body.state).toEqual(layout);
  });

  it('should answer 401 without a signed-in user', async () => {
    expect((await app.anonymous.get('/api/grid-preferences/students')).status).toBe(401);
  });
});
