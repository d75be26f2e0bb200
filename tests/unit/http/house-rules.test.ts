// The house rules of the server's HTTP side, checked on the source: route files export only their
// HTTP methods and answer through the one layer (lib/http/server.ts), nothing outside app/ imports
// from app/, and lib/ has no import cycles (runtime imports; type-only imports are erased).
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, normalize, relative } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

const root = normalize(join(dirname(fileURLToPath(import.meta.url)), '../../..'));

function sourceFiles(dir: string): string[] {
  return readdirSync(join(root, dir)).flatMap((name) => {
    const path = join(dir, name);
    if (statSync(join(root, path)).isDirectory()) return sourceFiles(path);
    return /\.tsx?$/.test(name) && !name.endsWith('.d.ts') ? [path] : [];
  });
}

const read = (path: string) => readFileSync(join(root, path), 'utf8');
const IMPORT = /^(?:import|export)\s+(type\s+)?(?:[^;]*?\s+from\s+)?'([^']+)'/gm;

/** The repository path a specifier names, or null for packages. */
function target(from: string, specifier: string): string | null {
  if (specifier.startsWith('@/')) return specifier.slice(2);
  if (specifier.startsWith('.')) return normalize(join(dirname(from), specifier));
  return null;
}

function runtimeImports(path: string): string[] {
  const found: string[] = [];
  for (const match of read(path).matchAll(IMPORT)) {
    const to = match[1] ? null : target(path, match[2]);
    if (!to) continue;
    const file = [`${to}.ts`, `${to}.tsx`, join(to, 'index.ts')].find((candidate) => {
      try {
        return statSync(join(root, candidate)).isFile();
      } catch {
        return false;
      }
    });
    if (file) found.push(file);
  }
  return found;
}

const HTTP_METHODS = new Set(['GET', 'POST', 'PUT', 'PATCH', 'DELETE', 'HEAD', 'OPTIONS']);
const ROUTE_CONFIG = new Set(['dynamic', 'revalidate', 'runtime', 'fetchCache', 'preferredRegion', 'maxDuration']);

describe('route files', () => {
  const routes = sourceFiles('app/api').filter((path) => path.endsWith('route.ts'));

  it('export only HTTP methods and route config', () => {
    const exported = routes.flatMap((path) =>
      [...read(path).matchAll(/^export\s+(?:async\s+)?(?:function|const|let|type|interface|class)\s+(\w+)|^export\s+(?:type\s+)?\{([^}]*)\}/gm)].flatMap((match) =>
        (match[1] ? [match[1]] : match[2].split(',').map((name) => name.trim().split(/\s+as\s+/).pop()!)).map((name) => ({ path, name })),
      ),
    );
    expect(exported.filter(({ name }) => !HTTP_METHODS.has(name) && !ROUTE_CONFIG.has(name))).toEqual([]);
  });

  it("answer through lib/http/server's handler (next-auth's own route aside)", () => {
    const outside = routes.filter((path) => !path.includes('[...nextauth]') && !/import \{[^}]*\bhandler\b[^}]*\} from '@\/lib\/http\/server'/.test(read(path)));
    expect(outside).toEqual([]);
  });
});

describe('imports', () => {
  it('never reach into app/ from components/ or lib/', () => {
    const files = [...sourceFiles('components'), ...sourceFiles('lib')];
    const intoApp = files.flatMap((path) =>
      [...read(path).matchAll(IMPORT)].map((match) => target(path, match[2])).filter((to) => to?.startsWith('app/')).map((to) => `${path} → ${to}`),
    );
    expect(intoApp).toEqual([]);
  });

  it('form no cycles in lib/', () => {
    const graph = new Map(sourceFiles('lib').map((path) => [path, runtimeImports(path)]));
    const cycles: string[][] = [];
    const state = new Map<string, 'open' | 'done'>();
    const stack: string[] = [];
    const visit = (path: string) => {
      state.set(path, 'open');
      stack.push(path);
      for (const next of graph.get(path) ?? []) {
        if (state.get(next) === 'open') cycles.push([...stack.slice(stack.indexOf(next)), next].map((file) => relative('lib', file)));
        else if (!state.has(next) && graph.has(next)) visit(next);
      }
      stack.pop();
      state.set(path, 'done');
    };
    for (const path of graph.keys()) if (!state.has(path)) visit(path);
    expect(cycles).toEqual([]);
  });
});
