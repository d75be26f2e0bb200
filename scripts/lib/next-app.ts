// Building and serving the Next.js app against a started stack.
import { join } from 'node:path';
import { projectRoot, stackEnvironment, type StackProfile } from './stack';
import { log, runCommand, startProcess, waitForHttp, type LongRunning } from './processes';
import { bundleFieldWorker, watchFieldWorker } from './field-worker-bundle';

const nextCli = join(projectRoot, 'node_modules', 'next', 'dist', 'bin', 'next');

// The demo and the test run build into different folders, so a test run can build while the
// demo is serving its own build.
const DIST_DIRS: Record<StackProfile['name'], string> = { demo: '.next', test: '.next-test' };

function appEnvironment(profile: StackProfile): NodeJS.ProcessEnv {
  return { ...stackEnvironment(profile), NEXT_DIST_DIR: DIST_DIRS[profile.name] };
}

export async function buildApp(profile: StackProfile) {
  await bundleFieldWorker();
  log(`building the app (next build → ${DIST_DIRS[profile.name]})`);
  await runCommand(process.execPath, [nextCli, 'build'], { cwd: projectRoot, env: appEnvironment(profile) });
}

async function serve(profile: StackProfile, mode: 'start' | 'dev'): Promise<LongRunning> {
  const url = `http://127.0.0.1:${profile.ports.app}`;
  const server = startProcess(process.execPath, [nextCli, mode, '--hostname', '127.0.0.1', '--port', String(profile.ports.app)], {
    cwd: projectRoot,
    env: appEnvironment(profile),
  });
  await waitForHttp(`${url}/api/health`, server, `next ${mode}`);
  return server;
}

export function startApp(profile: StackProfile) {
  return serve(profile, 'start');
}

export async function startDevServer(profile: StackProfile) {
  // Lives as long as this process (the dev task): esbuild's service stops with it.
  await watchFieldWorker();
  return serve(profile, 'dev');
}
