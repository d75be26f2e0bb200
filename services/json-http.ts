// The small HTTP JSON servers of the stand-ins (the mail sink's endpoint).
import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http';

export type JsonReply = (status: number, body: unknown) => void;

export type JsonHttpServer = { url: string; close: () => Promise<void> };

/** Serves `handle` on 127.0.0.1:port; resolves once it listens. */
export async function serveJson(port: number, handle: (request: IncomingMessage, url: URL, reply: JsonReply) => void): Promise<JsonHttpServer> {
  const server: Server = createServer((request: IncomingMessage, response: ServerResponse) => {
    const reply: JsonReply = (status, body) => {
      response.writeHead(status, { 'content-type': 'application/json' });
      response.end(JSON.stringify(body));
    };
    handle(request, new URL(request.url ?? '/', `http://127.0.0.1:${port}`), reply);
  });
  await new Promise<void>((resolve, reject) => {
    server.on('error', reject);
    server.listen(port, '127.0.0.1', () => resolve());
  });
  return {
    url: `http://127.0.0.1:${port}`,
    close: async () => {
      server.closeAllConnections();
      await new Promise<void>((resolve) => server.close(() => resolve()));
    },
  };
}
