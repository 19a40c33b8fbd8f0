import { request as httpRequest, type ClientRequest, type IncomingMessage } from 'node:http';
import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ROUTE_FILE_MAX_BYTES } from '../../../api/road-routes/route-upload';
import { createTestContext } from '../../support/test-app';
import { sessionCookies } from '../../support/session-cookie';
import { truncateAll } from '../../support/test-database';

const context = createTestContext();
let server: Server;
let port: number;
let cookie: string;

beforeAll(async () => {
  await truncateAll(context.db);
  cookie = await sessionCookies(context.db, context.deps.config)('planner');
  server = context.app.listen(0, '127.0.0.1');
  await new Promise((resolve) => server.once('listening', resolve));
  port = (server.address() as AddressInfo).port;
});
afterAll(async () => {
  await new Promise((resolve) => server.close(resolve));
  await context.close();
});

const BOUNDARY = 'spec-boundary';
const MIB = 1024 * 1024;

describe('uploads over the limit (issue 11)', () => {
  it('answers 413 from Content-Length alone, before the body is sent', async () => {
    const declared = 300 * MIB;
    const client = openUpload({ 'Content-Length': String(declared) });
    client.request.write(partHeader());

    const response = await client.response;

    expect(response.status).toBe(413);
    expect(JSON.parse(response.body).error).toMatchObject({ code: 'file_too_large' });
    expect(client.written()).toBeLessThan(MIB);
    await client.closed;
  });

  it('stops reading a body without Content-Length as soon as it passes the limit', async () => {
    const client = openUpload({ 'Transfer-Encoding': 'chunked' });
    client.request.write(partHeader());
    const chunk = Buffer.alloc(MIB, 0x41);
    let stopped = false;
    const settled = client.response.then(
      (response) => response,
      () => null,
    );
    void settled.then(() => (stopped = true));

    // Keep sending until the server answers or closes; a server that reads on would take all 200 MiB.
    while (!stopped && client.written() < 200 * MIB) {
      if (!client.request.write(chunk)) await Promise.race([new Promise((resolve) => client.request.once('drain', resolve)), settled]);
    }
    const response = await settled;

    expect(client.written()).toBeLessThan(ROUTE_FILE_MAX_BYTES + 32 * MIB);
    if (response) expect(response.status).toBe(413);
  });
});

// Helpers

function partHeader(): string {
  return `--${BOUNDARY}\r\nContent-Disposition: form-data; name="file"; filename="huge.geojson"\r\nContent-Type: application/json\r\n\r\n`;
}

interface Answer {
  status: number;
  headers: IncomingMessage['headers'];
  body: string;
}

/** A multipart upload to the route import, written by hand so its body can be streamed and counted. */
function openUpload(headers: Record<string, string>): {
  request: ClientRequest;
  response: Promise<Answer>;
  written: () => number;
  closed: Promise<void>;
} {
  let written = 0;
  const request = httpRequest({
    host: '127.0.0.1',
    port,
    method: 'POST',
    path: '/api/routes/import',
    headers: { Cookie: cookie, 'Content-Type': `multipart/form-data; boundary=${BOUNDARY}`, ...headers },
  });
  const write = request.write.bind(request) as (chunk: Buffer | string) => boolean;
  request.write = ((chunk: Buffer | string) => {
    written += Buffer.byteLength(chunk);
    return write(chunk);
  }) as ClientRequest['write'];
  const response = new Promise<Answer>((resolve, reject) => {
    request.once('response', (incoming) => {
      let body = '';
      incoming.setEncoding('utf8');
      incoming.on('data', (text: string) => (body += text));
      incoming.once('end', () => resolve({ status: incoming.statusCode ?? 0, headers: incoming.headers, body }));
      incoming.once('error', reject);
    });
    request.once('error', reject);
  });
  const closed = new Promise<void>((resolve) => request.once('socket', (socket) => socket.once('close', () => resolve())));
  request.on('error', () => undefined);
  return { request, response, written: () => written, closed };
}
