import type request from 'supertest';

/**
 * The answer's body as the bytes sent: superagent buffers and parses only text and JSON by
 * itself, so a binary answer (a PDF, a recording, an archive) is gathered chunk by chunk with
 * a custom `.parse()` (superagent docs, "Parsing response bodies").
 */
export function binary(test: request.Test): request.Test {
  return test.buffer(true).parse((response, callback) => {
    const chunks: Buffer[] = [];
    response.on('data', (chunk: Buffer) => chunks.push(chunk));
    response.on('end', () => callback(null, Buffer.concat(chunks)));
  });
}
