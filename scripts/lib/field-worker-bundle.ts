// The studio's field worker (lib/studio/client/field-worker.ts and everything it imports) bundled
// by esbuild into one classic script, public/field-worker.js, which the app serves as a static
// file: the browser fetches and compiles one file instead of the framework's chunk loader pulling
// the worker's modules one after the other (issue 15: 1.1 s of the editor's opening went there).
// Built with the app (`npm test`, `npm run demo`), rebuilt on every change under `npm run dev`.
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { build, context, type BuildOptions } from 'esbuild';
import { log } from './processes';

const projectRoot = join(dirname(fileURLToPath(import.meta.url)), '..', '..');

/** Where the page starts the worker from (lib/studio/client/field-client.ts names the same path). */
export const FIELD_WORKER_OUTPUT = join(projectRoot, 'public', 'field-worker.js');

/** esbuild's options for the worker: readable (names kept) in production, with a source map in development. */
export function fieldWorkerBuildOptions(development: boolean): BuildOptions {
  return {
    absWorkingDir: projectRoot,
    entryPoints: ['lib/studio/client/field-worker.ts'],
    // tsconfig.json's "@/*" paths resolve the project's own imports.
    tsconfig: join(projectRoot, 'tsconfig.json'),
    bundle: true,
    // A classic worker script: no module graph to load, every browser runs it.
    format: 'iife',
    platform: 'browser',
    target: 'es2022',
    outfile: FIELD_WORKER_OUTPUT,
    // Names are kept (whitespace and syntax only): CPU profiles of the worker stay readable.
    minifyWhitespace: !development,
    minifySyntax: !development,
    sourcemap: development ? 'inline' : false,
    define: { 'process.env.NODE_ENV': development ? '"development"' : '"production"' },
    legalComments: 'none',
    logLevel: 'warning',
  };
}

/** Writes public/field-worker.js once; fails (with esbuild's messages) when the worker's code does not bundle. */
export async function bundleFieldWorker(): Promise<void> {
  log('bundling the field worker (esbuild → public/field-worker.js)');
  await build(fieldWorkerBuildOptions(false));
}

/** Writes public/field-worker.js and again after every change of its sources, until `stop`. */
export async function watchFieldWorker(): Promise<{ stop(): Promise<void> }> {
  const watcher = await context(fieldWorkerBuildOptions(true));
  await watcher.rebuild();
  await watcher.watch();
  log('bundling the field worker on every change (esbuild → public/field-worker.js)');
  return { stop: () => watcher.dispose() };
}
