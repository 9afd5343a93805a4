import { Worker } from 'node:worker_threads';

/**
 * HTTP clients on a worker thread, so the server under test has the main thread to itself as
 * it would in production, and a client's own work (sending, reading the body) is not charged to
 * the product. They use node:http with keep-alive connections, the leanest client Node has:
 * on this two-core machine the client's CPU time shows in every timing, and `fetch` cost about
 * 1 ms more per request than the server spent on a page's whole answer path outside the
 * database (measured, tests/bench/NOTES.md). Each timing is request sent to last byte read,
 * for a 200 answer.
 */
const workerSource = `
const { parentPort } = require('node:worker_threads');
const http = require('node:http');
const agent = new http.Agent({ keepAlive: true, maxSockets: 64 });
const get = (url, token) => new Promise((resolve, reject) => {
  const request = http.get(url, { agent, headers: { authorization: 'Bearer ' + token } }, (response) => {
    const chunks = [];
    response.on('data', (chunk) => chunks.push(chunk));
    response.on('end', () => resolve({ status: response.statusCode, body: Buffer.concat(chunks) }));
    response.on('error', reject);
  });
  request.on('error', reject);
});
let stopping = false;
parentPort.on('message', async (message) => {
  if (message === 'stop') { stopping = true; return; }
  stopping = false;
  const { base, token, paths, clients, runs } = message;
  const latencies = [];
  let failure;
  await Promise.all(Array.from({ length: clients }, async (_, client) => {
    for (let request = 0; runs === undefined ? !stopping : request < runs; request += 1) {
      const path = paths[(client + request) % paths.length];
      const start = performance.now();
      const { status, body } = await get(base + path, token);
      latencies.push(performance.now() - start);
      if (status !== 200) failure = path + ' answered ' + status + ': ' + body.toString();
    }
  }));
  parentPort.postMessage({ latencies, failure });
});
`;

export interface HttpClients {
  /** `runs` requests, one after another, of one path; answers every latency. */
  sequential(path: string, runs: number): Promise<number[]>;
  /** `clients` loops over `paths` until `stop()`; answers every latency when they have ended. */
  start(paths: string[], clients: number): { stop(): Promise<number[]> };
  close(): Promise<number>;
}

export function httpClients(base: string, token: string): HttpClients {
  const worker = new Worker(workerSource, { eval: true });
  const next = () =>
    new Promise<number[]>((resolve, reject) => {
      const failed = (error: Error) => reject(error);
      worker.once('error', failed);
      worker.once('message', (result: { latencies: number[]; failure?: string }) => {
        worker.off('error', failed);
        if (result.failure) reject(new Error(result.failure));
        else resolve(result.latencies);
      });
    });
  return {
    sequential(path, runs) {
      const answer = next();
      worker.postMessage({ base, token, paths: [path], clients: 1, runs });
      return answer;
    },
    start(paths, clients) {
      const answer = next();
      worker.postMessage({ base, token, paths, clients });
      return {
        stop: () => {
          worker.postMessage('stop');
          return answer;
        },
      };
    },
    close: () => worker.terminate(),
  };
}
