// The accounts room: who someone is and what they may do: sign-up, e-mail confirmation,
// password reset, sign-in with its limits, sessions and roles, and the Actor that server calls act
// for (actor.ts). Server code, except roles.ts, schemas.ts, sign-in-problems.ts, safe-callback.ts and
// types.ts (the account routes' answers), which are plain data and rules that client components
// import directly (never through this index, which pulls in next-auth and the database).
export * from './roles';
export * from './schemas';
export * from './sign-in-problems';
export * from './safe-callback';
export * from './passwords';
export * from './users';
export * from './sign-in';
export * from './session';
export * from './actor';
export * from './mail-texts';
export * from './types';
