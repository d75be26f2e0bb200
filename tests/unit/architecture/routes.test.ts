// Route files are thin: they export only their HTTP methods (and Next's route settings) and answer
// through the one HTTP layer, lib/http/server.ts's handler. Their request and response types live
// in lib/<room>/types.ts (rooms.test.ts checks nothing imports app/).
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { PROJECT_ROOT, readImportGraph } from './import-graph';

const HTTP_METHODS = new Set(['GET', 'POST', 'PUT', 'PATCH', 'DELETE', 'HEAD', 'OPTIONS']);
const ROUTE_SETTINGS = new Set(['dynamic', 'revalidate', 'runtime', 'fetchCache', 'preferredRegion', 'maxDuration']);

const routes = [...readImportGraph(['app/api']).keys()].filter((file) => file.endsWith('/route.ts'));
const read = (file: string) => readFileSync(path.join(PROJECT_ROOT, file), 'utf8');

describe('route files', () => {
  it('are found', () => {
    expect(routes.length).toBeGreaterThan(20);
  });

  it('export only HTTP methods and route settings', () => {
    const exported = routes.flatMap((file) =>
      [...read(file).matchAll(/^export\s+(?:async\s+)?(?:function|const|let|type|interface|class)\s+(\w+)|^export\s+(?:type\s+)?\{([^}]*)\}/gm)].flatMap((match) =>
        (match[1] ? [match[1]] : match[2].split(',').map((name) => name.trim().split(/\s+as\s+/).pop()!)).map((name) => `${file}: ${name}`),
      ),
    );
    expect(exported.filter((entry) => !HTTP_METHODS.has(entry.split(': ')[1]) && !ROUTE_SETTINGS.has(entry.split(': ')[1]))).toEqual([]);
  });

  it("answer through lib/http/server's handler (next-auth's own route aside)", () => {
    const outside = routes.filter((file) => !file.includes('[...nextauth]') && !/import \{[^}]*\bhandler\b[^}]*\} from '@\/lib\/http\/server'/.test(read(file)));
    expect(outside).toEqual([]);
  });
});
