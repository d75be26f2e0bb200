// The rooms of the house and what each may import, as DEVELOPERS.md ("Rooms and what they may
// import") writes them. Every source file's imports are read from the code; a new import that breaks
// a rule, an import cycle, a component reaching into app/, or server code pulled into the browser
// fails here with the files named.
import { existsSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { importCycles, packageName, PROJECT_ROOT, reachableFrom, readImportGraph, type SourceFile } from './import-graph';

const graph = readImportGraph(['lib', 'components', 'app', 'services', 'bin', 'bench', 'scripts', 'db', 'instrumentation-client.ts']);

/** The room of a file: `lib/<room>` for the library, otherwise its top folder. */
function roomOf(file: string): string {
  const [top, second] = file.split('/');
  return top === 'lib' ? `lib/${second}` : top;
}

/** What each room under lib/ may import besides itself (project rooms) and which packages. */
const LIB_ROOMS: Record<string, { rooms: string[]; packages: string[] | 'any' }> = {
  'lib/field': { rooms: [], packages: [] },
  'lib/groom': { rooms: ['lib/field'], packages: ['zod', 'three', 'three-mesh-bvh', 'sharp'] },
  // the handler checks the session's roles; lib/accounts in turn uses only the envelope (types,
  // errors), never server.ts, which the cycle check would catch.
  'lib/http': { rooms: ['lib/accounts'], packages: 'any' },
  'lib/platform': { rooms: [], packages: 'any' },
  'lib/accounts': { rooms: ['lib/platform', 'lib/http'], packages: 'any' },
  'lib/studio': { rooms: ['lib/platform', 'lib/http', 'lib/accounts', 'lib/field', 'lib/groom'], packages: 'any' },
  'lib/market': { rooms: ['lib/platform', 'lib/http', 'lib/accounts', 'lib/field', 'lib/groom', 'lib/studio'], packages: 'any' },
};

/**
 * Inside the two pure libraries, sub-rooms import only downward (lib/field/README.md and
 * lib/groom/README.md draw the same picture). Top-level files of a library are listed by name.
 */
const INNER_ROOMS: Record<string, string[]> = {
  'lib/field/mesh': [],
  'lib/field/linalg': [],
  'lib/field/clock.ts': [],
  'lib/field/connection': ['lib/field/mesh', 'lib/field/linalg', 'lib/field/clock.ts'],
  'lib/field/suggest': ['lib/field/mesh', 'lib/field/linalg', 'lib/field/clock.ts', 'lib/field/connection', 'lib/field/indices.ts'],
  'lib/groom/errors.ts': [],
  'lib/groom/spec': ['lib/groom/errors.ts'],
  'lib/groom/place': ['lib/groom/spec', 'lib/groom/errors.ts'],
  'lib/groom/grow': ['lib/groom/place', 'lib/groom/spec', 'lib/groom/errors.ts'],
  'lib/groom/export': ['lib/groom/grow', 'lib/groom/place', 'lib/groom/spec', 'lib/groom/transfer', 'lib/groom/errors.ts'],
  'lib/groom/render': ['lib/groom/grow', 'lib/groom/place', 'lib/groom/spec', 'lib/groom/errors.ts'],
  'lib/groom/transfer': ['lib/groom/place', 'lib/groom/spec', 'lib/groom/errors.ts'],
};

/** The sub-room of a file of lib/field or lib/groom: its folder there, or the file itself at the top. */
function innerRoomOf(file: string): string {
  const parts = file.split('/');
  return parts.length > 3 ? parts.slice(0, 3).join('/') : file;
}

/** Modules of server-only rooms that are plain data and rules, safe (and meant) for the browser. */
const CLIENT_SAFE = new Set([
  'lib/accounts/roles.ts',
  'lib/accounts/schemas.ts',
  'lib/accounts/sign-in-problems.ts',
  'lib/accounts/safe-callback.ts',
]);
const SERVER_ONLY_ROOMS = ['lib/platform/', 'lib/accounts/'];
const SERVER_ONLY_FILES = new Set(['lib/http/server.ts']);
const SERVER_ONLY_PACKAGES = ['pg', 'knex', 'pg-boss', 'sharp', 'nodemailer', 'stripe', 'bcryptjs', '@aws-sdk/', 'next-auth/next', 'node:'];

/**
 * Files allowed past 450 lines, each because one idea needs the room (DEVELOPERS.md names them too).
 * A file that shrinks below the limit must leave this list, so the list stays true.
 */
const LONG_FILES: Record<string, string> = {};
const MAX_LINES = 450;

function isServerOnly(file: string): boolean {
  if (CLIENT_SAFE.has(file)) return false;
  return SERVER_ONLY_FILES.has(file) || SERVER_ONLY_ROOMS.some((room) => file.startsWith(room));
}

function importsOf(file: SourceFile) {
  return file.projectImports.map((target) => ({ target, room: roomOf(target) }));
}

const files = [...graph.values()];

describe('the import graph reader', () => {
  it('finds a cycle through several files, a file importing itself, and none in a chain', () => {
    const edges = new Map<string, string[]>([
      ['a', ['b']],
      ['b', ['c']],
      ['c', ['a', 'd']],
      ['d', []],
      ['e', ['e']],
      ['f', ['d']],
    ]);
    expect(importCycles(edges)).toEqual(expect.arrayContaining([['a', 'b', 'c'], ['e']]));
    expect(importCycles(edges)).toHaveLength(2);
    expect(importCycles(new Map([['x', ['y']], ['y', []]]))).toEqual([]);
  });

  it('reads the project: the field engine, the app and client components are all there', () => {
    expect(graph.has('lib/field/index.ts')).toBe(true);
    expect(files.some((file) => file.path.startsWith('app/api/') && file.path.endsWith('route.ts'))).toBe(true);
    expect(files.filter((file) => file.isClientEntry).length).toBeGreaterThan(10);
  });
});

describe('rooms', () => {
  it('have no import cycles', () => {
    const edges = new Map(files.map((file) => [file.path, file.projectImports]));
    expect(importCycles(edges)).toEqual([]);
  });

  it('every folder under lib/ is a room with an index.ts', () => {
    const rooms = new Set(files.filter((file) => file.path.startsWith('lib/')).map((file) => roomOf(file.path)));
    const missing = [...rooms].filter((room) => !existsSync(path.join(PROJECT_ROOT, room, 'index.ts')));
    expect(missing).toEqual([]);
    expect([...rooms].filter((room) => !(room in LIB_ROOMS))).toEqual([]);
  });

  it('lib/ rooms import only the rooms and packages they are allowed', () => {
    const breaches: string[] = [];
    for (const file of files.filter((f) => f.path.startsWith('lib/'))) {
      const room = roomOf(file.path);
      const rule = LIB_ROOMS[room];
      if (!rule) continue;
      for (const { target, room: targetRoom } of importsOf(file)) {
        if (targetRoom !== room && !rule.rooms.includes(targetRoom)) breaches.push(`${file.path} → ${target}`);
      }
      if (rule.packages !== 'any') {
        for (const name of file.packageImports) if (!rule.packages.includes(packageName(name))) breaches.push(`${file.path} → package ${name}`);
      }
    }
    expect(breaches).toEqual([]);
  });

  it('inside lib/field and lib/groom, sub-rooms import only downward, and only lib/groom reaches lib/field (through its index)', () => {
    const breaches: string[] = [];
    for (const file of files.filter((f) => f.path.startsWith('lib/field/') || f.path.startsWith('lib/groom/'))) {
      const inner = innerRoomOf(file.path);
      for (const target of file.projectImports) {
        if (target === 'lib/field/index.ts' && file.path.startsWith('lib/groom/')) continue;
        const targetInner = innerRoomOf(target);
        if (targetInner === inner) continue;
        const allowed = INNER_ROOMS[inner];
        if (allowed && !allowed.includes(targetInner)) breaches.push(`${file.path} → ${target}`);
        if (file.path.startsWith('lib/groom/') && target.startsWith('lib/field/')) breaches.push(`${file.path} → ${target} (use lib/field's index)`);
        if (target === 'lib/field/index.ts' || target === 'lib/groom/index.ts') {
          if (roomOf(file.path) === roomOf(target)) breaches.push(`${file.path} → ${target} (a room does not import its own front door)`);
        }
      }
    }
    expect(breaches).toEqual([]);
  });

  it("the editor's browser side (lib/studio/client) imports only the pure libraries, the HTTP client and the studio's shared shapes", () => {
    const allowed = (target: string) =>
      target.startsWith('lib/studio/client/') ||
      target.startsWith('lib/field/') ||
      target.startsWith('lib/groom/') ||
      ['lib/http/client.ts', 'lib/http/types.ts', 'lib/http/field-errors.ts', 'lib/http/no-eval.ts', 'lib/studio/types.ts', 'lib/studio/validation.ts'].includes(target);
    const breaches = files
      .filter((file) => file.path.startsWith('lib/studio/client/'))
      .flatMap((file) => file.projectImports.filter((target) => !allowed(target)).map((target) => `${file.path} → ${target}`));
    expect(breaches).toEqual([]);
  });

  it('components never import app/, and lib/ never imports components/ or app/', () => {
    const breaches = files
      .filter((file) => file.path.startsWith('components/') || file.path.startsWith('lib/'))
      .flatMap((file) =>
        importsOf(file)
          .filter(({ room }) => room === 'app' || (file.path.startsWith('lib/') && room === 'components'))
          .map(({ target }) => `${file.path} → ${target}`),
      );
    expect(breaches).toEqual([]);
  });

  it('code that runs in the browser (client components, the field worker) never pulls in server-only code', () => {
    const entries = files.filter((file) => file.isClientEntry || file.path.endsWith('field-worker.ts') || file.path === 'instrumentation-client.ts');
    expect(entries.some((file) => file.path.endsWith('field-worker.ts'))).toBe(true);
    const breaches: string[] = [];
    for (const entry of entries) {
      for (const reached of reachableFrom(entry.path, graph)) {
        if (isServerOnly(reached)) breaches.push(`${entry.path} ⇒ ${reached}`);
        for (const name of graph.get(reached)?.packageImports ?? []) {
          if (SERVER_ONLY_PACKAGES.some((server) => name === server || name.startsWith(server))) breaches.push(`${entry.path} ⇒ ${reached} → package ${name}`);
        }
      }
    }
    expect([...new Set(breaches)]).toEqual([]);
  });

  it(`files under lib/ and components/ stay under ${MAX_LINES} lines unless one idea needs the room`, () => {
    const long = files
      .filter((file) => (file.path.startsWith('lib/') || file.path.startsWith('components/')) && file.lines > MAX_LINES)
      .map((file) => file.path)
      .sort();
    expect(long).toEqual(Object.keys(LONG_FILES).sort());
  });
});
