import express from 'express';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { failedTokenLimit, tokenFailuresExceeded } from './rate-limits';

/** An app whose good token answers after a pause, so many good requests are in flight at once. */
function slowApp(limit: number) {
  const app = express();
  app.use(failedTokenLimit(limit));
  app.get('/thing', async (req, res) => {
    if (req.get('authorization') !== 'Bearer good') {
      const retryAfter = res.locals[tokenFailuresExceeded] as number | undefined;
      if (retryAfter !== undefined) res.set('Retry-After', String(retryAfter)).status(429);
      else res.status(401);
      res.json({ error: 'bad token' });
      return;
    }
    await new Promise((resolve) => setTimeout(resolve, 50));
    res.json({ ok: true });
  });
  return app;
}

describe('failedTokenLimit', () => {
  it('should never refuse good requests, however many are in flight together', async () => {
    const app = slowApp(3);
    const answers = await Promise.all(
      Array.from({ length: 20 }, () =>
        request(app).get('/thing').set('Authorization', 'Bearer good'),
      ),
    );
    expect(answers.map((answer) => answer.status)).toEqual(answers.map(() => 200));
  });

  it('should refuse bad tokens from an address over the limit and still take a good one', async () => {
    const app = slowApp(3);
    const bad = () => request(app).get('/thing').set('Authorization', 'Bearer guess');
    expect([(await bad()).status, (await bad()).status, (await bad()).status]).toEqual([
      401, 401, 401,
    ]);
    const refused = await bad();
    expect(refused.status).toBe(429);
    expect(Number(refused.headers['retry-after'])).toBeGreaterThan(0);
    expect((await request(app).get('/thing').set('Authorization', 'Bearer good')).status).toBe(200);
    expect((await bad()).status).toBe(429);
  });

  it('should leave requests without a bearer token alone', async () => {
    const app = slowApp(1);
    await request(app).get('/thing').set('Authorization', 'Bearer guess');
    expect((await request(app).get('/thing')).status).toBe(401);
    expect((await request(app).get('/thing')).status).toBe(401);
  });
});
