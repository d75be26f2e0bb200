// The project's import graph, read from the source with TypeScript's own parser, so the room rules in
// rooms.test.ts check what the code really imports: every import for the rules and cycles (a type
// import ties two modules as much as any), and the run-time ones for what reaches the browser.
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import path from 'node:path';
import ts from 'typescript';

export const PROJECT_ROOT = path.resolve(import.meta.dirname, '../../..');

/** A source file of the project and what it imports: project files (resolved paths) and packages. */
export type SourceFile = {
  path: string;
  lines: number;
  isClientEntry: boolean;
  projectImports: string[];
  /** The project imports that load code at run time (`import type` and type-only exports left out). */
  runtimeImports: string[];
  /** Bare specifiers as written ('next-auth/react', 'node:fs'). */
  packageImports: string[];
};

const SOURCE = /\.(ts|tsx|mts|mjs)$/;
const SKIP = new Set(['node_modules', '.next', '.next-test', '.next-bench', '.data', '.git', 'public']);
const CANDIDATES = ['', '.ts', '.tsx', '.mts', '.mjs', '/index.ts', '/index.tsx'];

function listSources(folder: string, out: string[]) {
  for (const name of readdirSync(path.join(PROJECT_ROOT, folder))) {
    if (SKIP.has(name)) continue;
    const relative = folder ? `${folder}/${name}` : name;
    const stat = statSync(path.join(PROJECT_ROOT, relative));
    if (stat.isDirectory()) listSources(relative, out);
    else if (SOURCE.test(name) && !name.endsWith('.d.ts')) out.push(relative);
  }
}

/** The project file a specifier names ('@/…' or relative), or null for a package or a non-source file. */
export function resolveSpecifier(specifier: string, fromFile: string): string | null {
  let base: string;
  if (specifier.startsWith('@/')) base = specifier.slice(2);
  else if (specifier.startsWith('.')) base = path.posix.normalize(path.posix.join(path.posix.dirname(fromFile), specifier));
  else return null;
  for (const ending of CANDIDATES) {
    const candidate = base + ending;
    const absolute = path.join(PROJECT_ROOT, candidate);
    if (SOURCE.test(candidate) && existsSync(absolute) && statSync(absolute).isFile()) return candidate;
  }
  return null;
}

/** The npm package a bare specifier names ('@scope/name/sub' → '@scope/name'). */
export function packageName(specifier: string): string {
  if (specifier.startsWith('node:')) return specifier;
  const parts = specifier.split('/');
  return specifier.startsWith('@') ? parts.slice(0, 2).join('/') : parts[0];
}

/**
 * The specifiers a file names: import and export declarations (type-only when the clause or every
 * named binding says `type`), `import()` and `require()` with a literal, and
 * `new URL('./worker.ts', import.meta.url)`, which starts a worker from that file.
 */
function importsIn(file: string, text: string): { specifier: string; typeOnly: boolean }[] {
  const source = ts.createSourceFile(file, text, ts.ScriptTarget.Latest, false, file.endsWith('x') ? ts.ScriptKind.TSX : ts.ScriptKind.TS);
  const found: { specifier: string; typeOnly: boolean }[] = [];
  for (const statement of source.statements) {
    if (ts.isImportDeclaration(statement) && ts.isStringLiteral(statement.moduleSpecifier)) {
      const clause = statement.importClause;
      const bindings = clause?.namedBindings;
      const everyNamedIsType =
        !!clause && !clause.name && !!bindings && ts.isNamedImports(bindings) && bindings.elements.length > 0 && bindings.elements.every((element) => element.isTypeOnly);
      found.push({ specifier: statement.moduleSpecifier.text, typeOnly: !!clause?.isTypeOnly || everyNamedIsType });
    } else if (ts.isExportDeclaration(statement) && statement.moduleSpecifier && ts.isStringLiteral(statement.moduleSpecifier)) {
      const clause = statement.exportClause;
      const everyNamedIsType = !!clause && ts.isNamedExports(clause) && clause.elements.length > 0 && clause.elements.every((element) => element.isTypeOnly);
      found.push({ specifier: statement.moduleSpecifier.text, typeOnly: statement.isTypeOnly || everyNamedIsType });
    }
  }
  for (const match of text.matchAll(/(?<![\w.])(?:import|require)\(\s*(['"])([^'"]+)\1\s*\)/g)) {
    const typeOnly = /typeof\s+$/.test(text.slice(Math.max(0, match.index - 10), match.index));
    found.push({ specifier: match[2], typeOnly });
  }
  for (const match of text.matchAll(/new URL\((['"])(\.[^'"]+)\1,\s*import\.meta\.url\)/g)) found.push({ specifier: match[2], typeOnly: false });
  return found;
}

/** Every source file under the given top-level folders, with its imports. */
export function readImportGraph(folders: readonly string[]): Map<string, SourceFile> {
  const files: string[] = [];
  for (const folder of folders) {
    if (statSync(path.join(PROJECT_ROOT, folder)).isDirectory()) listSources(folder, files);
    else files.push(folder);
  }
  const graph = new Map<string, SourceFile>();
  for (const file of files) {
    const text = readFileSync(path.join(PROJECT_ROOT, file), 'utf8');
    const projectImports: string[] = [];
    const runtimeImports: string[] = [];
    const packageImports: string[] = [];
    for (const { specifier, typeOnly } of importsIn(file, text)) {
      const resolved = resolveSpecifier(specifier, file);
      if (resolved) {
        projectImports.push(resolved);
        if (!typeOnly) runtimeImports.push(resolved);
      } else if (!specifier.startsWith('.') && !specifier.startsWith('@/') && !typeOnly) packageImports.push(specifier);
    }
    graph.set(file, {
      path: file,
      lines: text.split('\n').length,
      isClientEntry: /^\s*(['"])use client\1/.test(text.replace(/^(\s*\/\/.*\n)*/, '')),
      projectImports: [...new Set(projectImports)],
      runtimeImports: [...new Set(runtimeImports)],
      packageImports: [...new Set(packageImports)],
    });
  }
  return graph;
}

/** The strongly connected groups of more than one file (or a file importing itself): the import cycles. */
export function importCycles(edges: ReadonlyMap<string, readonly string[]>): string[][] {
  // Tarjan's algorithm, iterative so a deep chain cannot overflow the stack.
  const index = new Map<string, number>();
  const low = new Map<string, number>();
  const onStack = new Set<string>();
  const stack: string[] = [];
  const cycles: string[][] = [];
  let counter = 0;
  for (const start of edges.keys()) {
    if (index.has(start)) continue;
    const work: { node: string; next: number }[] = [{ node: start, next: 0 }];
    index.set(start, counter);
    low.set(start, counter++);
    stack.push(start);
    onStack.add(start);
    while (work.length > 0) {
      const frame = work[work.length - 1];
      const targets = edges.get(frame.node) ?? [];
      if (frame.next < targets.length) {
        const target = targets[frame.next++];
        if (!edges.has(target)) continue;
        if (!index.has(target)) {
          index.set(target, counter);
          low.set(target, counter++);
          stack.push(target);
          onStack.add(target);
          work.push({ node: target, next: 0 });
        } else if (onStack.has(target)) {
          low.set(frame.node, Math.min(low.get(frame.node)!, index.get(target)!));
        }
        continue;
      }
      work.pop();
      if (work.length > 0) {
        const parent = work[work.length - 1].node;
        low.set(parent, Math.min(low.get(parent)!, low.get(frame.node)!));
      }
      if (low.get(frame.node) === index.get(frame.node)) {
        const group: string[] = [];
        let member: string;
        do {
          member = stack.pop()!;
          onStack.delete(member);
          group.push(member);
        } while (member !== frame.node);
        if (group.length > 1 || targets.includes(frame.node)) cycles.push(group.sort());
      }
    }
  }
  return cycles;
}

/** Every project file whose code loads with `start` (run-time imports only; start included). */
export function reachableFrom(start: string, graph: ReadonlyMap<string, SourceFile>): Set<string> {
  const seen = new Set([start]);
  const queue = [start];
  while (queue.length > 0) {
    for (const next of graph.get(queue.pop()!)?.runtimeImports ?? []) {
      if (!seen.has(next)) {
        seen.add(next);
        queue.push(next);
      }
    }
  }
  return seen;
}
