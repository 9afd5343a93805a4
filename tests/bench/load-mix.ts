import { Worker } from 'node:worker_threads';

/**
 * The load of the tail section (see load-tail.ts) on a worker thread, so the server under test
 * has the main thread to itself: `clients` loops that each send their next request when the last
 * is answered (a closed loop), or requests sent at a fixed rate whatever the answers (an open
 * arrival). Each request is drawn from the mix: reads of the grids and the Overview, a batch of
 * pass-offs, or an edit of one of the client's own students (their versions kept here, so two
 * clients never edit the same student and no edit meets a conflict).
 */
const workerSource = `
const { parentPort } = require('node:worker_threads');
const http = require('node:http');
const agent = new http.Agent({ keepAlive: true, maxSockets: 256 });
function send(base, token, method, path, body) {
  return new Promise((resolve, reject) => {
    const data = body === undefined ? undefined : Buffer.from(JSON.stringify(body));
    const headers = { authorization: 'Bearer ' + token };
    if (data) { headers['content-type'] = 'application/json'; headers['content-length'] = data.length; }
    const request = http.request(base + path, { method, agent, headers }, (response) => {
      const chunks = [];
      response.on('data', (chunk) => chunks.push(chunk));
      response.on('end', () => resolve({ status: response.statusCode, body: Buffer.concat(chunks).toString() }));
      response.on('error', reject);
    });
    request.on('error', reject);
    request.end(data);
  });
}
// A small seeded generator (mulberry32), so every run draws the same mix.
function random(seed) {
  return () => {
    seed = (seed + 0x6d2b79f5) | 0;
    let t = Math.imul(seed ^ (seed >>> 15), 1 | seed);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
parentPort.on('message', async (run) => {
  const { base, token, reads, requirements, students, editable, heardOn, mix } = run;
  const versions = new Map(editable.flat().map((s) => [s.id, s.version]));
  const result = { latencies: [], errors: [], passOffs: 0, edits: 0, edited: [], requests: 0 };
  let edit = 0;
  async function one(draw, client) {
    const pick = (list) => list[Math.floor(draw() * list.length)];
    const kind = draw();
    let method = 'GET', path, body, what;
    if (kind < mix.reads) { path = pick(reads); what = 'read'; }
    else if (kind < mix.reads + mix.passOffs) {
      method = 'POST'; path = '/api/pass-offs'; what = 'pass-offs';
      body = { passOffs: Array.from({ length: mix.batch }, () => {
        const requirement = pick(requirements);
        return { studentId: pick(students), requirementCode: requirement.code, heardOn,
          tempo: requirement.tempo, passed: draw() < 0.7 };
      }) };
    } else {
      const own = editable[client % editable.length];
      const student = own[Math.floor(draw() * own.length)];
      method = 'PATCH'; path = '/api/students/' + student.id; what = 'edit';
      body = { preferredName: 'Load ' + (edit++), version: versions.get(student.id) };
      if (own.busy && own.busy.has(student.id)) { method = 'GET'; path = pick(reads); what = 'read'; body = undefined; }
      else { own.busy = own.busy || new Set(); own.busy.add(student.id); }
      var editedId = student.id;
    }
    const start = performance.now();
    let answer;
    try { answer = await send(base, token, method, path, body); }
    catch (error) { answer = { status: 0, body: String(error) }; }
    result.latencies.push(performance.now() - start);
    result.requests++;
    if (answer.status >= 300) result.errors.push(method + ' ' + path + ' answered ' + answer.status + ': ' + answer.body.slice(0, 200));
    else if (what === 'pass-offs') result.passOffs += JSON.parse(answer.body).created;
    else if (what === 'edit') {
      result.edits++;
      result.edited.push(editedId);
      versions.set(editedId, JSON.parse(answer.body).version);
    }
    if (what === 'edit') editable[client % editable.length].busy.delete(editedId);
  }
  const ends = performance.now() + run.seconds * 1000;
  const started = performance.now();
  if (run.rate) {
    // Open arrival: one request every 1/rate seconds, whatever is still unanswered.
    const draw = random(run.seed);
    const pending = [];
    for (let at = 0; performance.now() < ends; at += 1000 / run.rate) {
      const wait = started + at - performance.now();
      if (wait > 0) await new Promise((resolve) => setTimeout(resolve, wait));
      pending.push(one(draw, pending.length));
    }
    await Promise.all(pending);
  } else {
    await Promise.all(Array.from({ length: run.clients }, async (_, client) => {
      const draw = random(run.seed + client);
      while (performance.now() < ends) await one(draw, client);
    }));
  }
  result.elapsedMs = performance.now() - started;
  parentPort.postMessage(result);
});
`;

/** What the mix draws from. */
export interface LoadMix {
  base: string;
  token: string;
  /** Paths of the grid pages and the Overview. */
  reads: string[];
  requirements: { code: string; tempo: number }[];
  /** Students a pass-off may be for. */
  students: number[];
  /** Each client's own students to edit, with their versions. */
  editable: { id: number; version: number }[][];
  heardOn: string;
  /** Shares of reads and pass-off batches (edits take the rest), and a batch's size. */
  mix: { reads: number; passOffs: number; batch: number };
}

/** What one run of the load saw. */
export interface LoadResult {
  latencies: number[];
  errors: string[];
  /** Pass-offs the server said it recorded, and student edits it acknowledged. */
  passOffs: number;
  edits: number;
  edited: number[];
  requests: number;
  elapsedMs: number;
}

/** Runs the mix once on a worker thread: closed loop with `clients`, or open arrival at `rate`. */
export async function runLoad(
  mix: LoadMix,
  run: { seconds: number; seed: number } & ({ clients: number } | { rate: number }),
): Promise<LoadResult> {
  const worker = new Worker(workerSource, { eval: true });
  try {
    return await new Promise<LoadResult>((resolve, reject) => {
      worker.once('error', reject);
      worker.once('message', resolve);
      worker.postMessage({ ...mix, ...run });
    });
  } finally {
    await worker.terminate();
  }
}
