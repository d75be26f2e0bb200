// The HTTP room: the one JSON envelope of every route handler under app/api, the one failure the
// areas throw (errors.ts), the server's way of answering (server.ts) and the client's way of
// calling (client.ts).
export * from './types';
export * from './field-errors';
export * from './errors';
export * from './server';
export * from './client';
