// The studio room: a groomer's growth surfaces, grooms, versions, exports and thumbnails on the
// server, and the background jobs that make them. Server code, except types.ts and validation.ts
// (shapes and rules the pages share) and client/, the editor's browser side (its own sub-room,
// never imported through this index).
export * from './types';
export * from './validation';
export * from './errors';
export * from './surfaces';
export * from './grooms';
export * from './exports';
export * from './thumbnails';
export * from './starting-spec';
export * from './jobs';
export * from './workers';
