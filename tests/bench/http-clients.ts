import { Worker } from 'node:worker_threads';

/**
 * HTTP clients on a worker thread, so the server under test has the main thread to itself as
 * it would in production, and a client's own work (fetch, reading the body) is not charged to
 * the product. Each timing is request sent to last byte read, for a 200 answer.
 */
const workerSource = `
const { parentPort } = require('node:worker_threads');
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
      const response = await fetch(base + path, { headers: { authorization: 'Bearer ' + token } });
      const body = await response.arrayBuffer();
      latencies.push(performance.now() - start);
      if (!response.ok) failure = path + ' answered ' + response.status + ': ' + Buffer.from(body).toString();
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
