// Entry point of `npm run demo`, `npm run dev` and `npm test`.
// On a fresh clone node_modules does not exist yet, so this file uses only Node's standard
// library: it installs the locked dependencies when they are missing, then hands over to the
// TypeScript task (run through tsx) and relays Ctrl-C / SIGTERM to it, so that the task can
// stop everything it started before the process ends.
import { spawn } from 'node:child_process';
import { existsSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const projectRoot = join(dirname(fileURLToPath(import.meta.url)), '..');
const tasks = {
  demo: 'scripts/demo.ts',
  dev: 'scripts/dev.ts',
  test: 'scripts/test.ts',
};

const [taskName, ...taskArgs] = process.argv.slice(2);
const taskFile = tasks[taskName];
if (!taskFile) {
  console.error(`Unknown task "${taskName ?? ''}". Known tasks: ${Object.keys(tasks).join(', ')}.`);
  process.exit(2);
}

function runToEnd(command, args) {
  return new Promise((resolve) => {
    const child = spawn(command, args, { cwd: projectRoot, stdio: 'inherit' });
    child.on('exit', (code, signal) => resolve(code ?? (signal ? 1 : 0)));
  });
}

// npm writes node_modules/.package-lock.json last, so its presence means a finished install.
if (!existsSync(join(projectRoot, 'node_modules', '.package-lock.json'))) {
  console.log('[whorlwind] node_modules is missing: installing the locked dependencies (npm ci)…');
  const code = await runToEnd('npm', ['ci', '--no-audit', '--no-fund']);
  if (code !== 0) {
    console.error('[whorlwind] npm ci failed; see the output above.');
    process.exit(code);
  }
}

const env = { ...process.env, NEXT_TELEMETRY_DISABLED: '1' };
const task = spawn(process.execPath, ['--import', 'tsx', taskFile, ...taskArgs], {
  cwd: projectRoot,
  stdio: 'inherit',
  env,
});

// A terminal's Ctrl-C reaches the task directly (same process group); a signal sent to this
// process alone (kill -INT) is passed on. The task treats a repeated signal as one.
for (const signal of ['SIGINT', 'SIGTERM', 'SIGHUP']) {
  process.on(signal, () => task.kill(signal));
}
task.on('exit', (code, signal) => {
  process.exit(code ?? (signal === 'SIGINT' ? 130 : 1));
});
