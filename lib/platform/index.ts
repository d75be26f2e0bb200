// The platform room: configuration, the database, the job queue, object storage, mail and the
// payment provider's SDK: the server-side services every area builds on. Server code, except
// html.ts (escaping) and types.ts (the health and caught-mail answers), which client code and the
// local stand-ins may import directly (never through this index).
export * from './env';
export * from './local-services';
export * from './db';
export * from './jobs';
export * from './storage';
export * from './mail';
export * from './html';
export * from './mail-sink';
export * from './payments';
export * from './file-names';
export * from './types';
