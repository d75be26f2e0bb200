// A route handler of app/api served over plain HTTP on loopback, as `next start` would pass it
// requests: the body read whole, headers copied, the handler's answer written back. The market
// tests use it where something outside the test process (the payments fake, a killed process's
// successor) must reach the real route over a socket.
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';

export type ServedRoute = { port: number; served: () => number; close: () => Promise<void> };

/** Serves `route` on 127.0.0.1:`port` (0: any free port); `served` counts the 2xx answers. */
export async function serveRoute(route: (request: Request) => Promise<Response>, port = 0): Promise<ServedRoute> {
  let served = 0;
  const server: Server = createServer(async (request, response) => {
    const chunks: Buffer[] = [];
    for await (const chunk of request) chunks.push(chunk as Buffer);
    const headers = new Headers();
    for (const [key, value] of Object.entries(request.headers)) if (typeof value === 'string') headers.set(key, value);
    const answer = await route(new Request(`http://127.0.0.1:${(server.address() as AddressInfo).port}${request.url}`, { method: request.method, headers, body: Buffer.concat(chunks) }));
    if (answer.ok) served += 1;
    response.writeHead(answer.status, { 'content-type': answer.headers.get('content-type') ?? 'application/json' });
    response.end(await answer.text());
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, '127.0.0.1', () => resolve());
  });
  return {
    port: (server.address() as AddressInfo).port,
    served: () => served,
    close: async () => {
      server.closeAllConnections();
      await new Promise<void>((resolve) => server.close(() => resolve()));
    },
  };
}
