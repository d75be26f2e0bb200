// `npm test`: everything against a throwaway stack (TEST_* ports, .data/test), so it can run
// while the demo runs. Phases: tsc (type check of the whole project), vitest (tests/unit and
// tests/integration; the tests that need jobs start a job-worker process as this script does),
// then one `next build` and Playwright (tests/browser) against `next start` with job worker(s).
// Every phase runs even when an earlier one failed (except the browser tests when the build
// failed); the exit code is non-zero if any failed.
//   npm test                      all phases
//   npm test -- vitest [args]     only vitest, e.g. `npm test -- vitest tests/integration/accounts.test.ts`
//   npm test -- browser [args]    only the build and the browser tests, e.g. `npm test -- browser --grep 403`
import { existsSync } from 'node:fs';
import { mkdir, readFile, rm } from 'node:fs/promises';
import { join } from 'node:path';
import { migrateAndSeed, projectRoot, stackEnvironment, startStack, testProfile, type StackProfile } from './lib/stack';
import { buildApp, startApp } from './lib/next-app';
import { startJobWorkers } from './lib/job-workers';
import { aptInstall } from './lib/postgres';
import { CommandFailed, log, runCommand, shutdown, stopEverythingOnSignals } from './lib/processes';

type Tally = { phase: string; passed: number; failed: number; error?: string };

const CHROMIUM = '/usr/bin/chromium';
const reportDir = join(projectRoot, '.data', 'test-reports');

async function ensureChromium() {
  if (existsSync(CHROMIUM)) return;
  if (process.getuid?.() !== 0) {
    throw new CommandFailed(`Chromium is missing at ${CHROMIUM}. Install it once with: sudo apt-get install -y chromium`);
  }
  log('Chromium is missing: apt-get install -y chromium…');
  await aptInstall('chromium');
}

async function runTypeCheck(): Promise<Tally> {
  log('type-checking the project (tsc --noEmit)');
  const tsc = join(projectRoot, 'node_modules', 'typescript', 'bin', 'tsc');
  try {
    await runCommand(process.execPath, [tsc, '--noEmit', '-p', projectRoot], { cwd: projectRoot });
    return { phase: 'typecheck', passed: 0, failed: 0 };
  } catch (failure) {
    return { phase: 'typecheck', passed: 0, failed: 0, error: (failure as Error).message };
  }
}

async function runVitest(profile: StackProfile, args: string[]): Promise<Tally> {
  const report = join(reportDir, 'vitest.json');
  await rm(report, { force: true });
  const vitest = join(projectRoot, 'node_modules', 'vitest', 'vitest.mjs');
  let error: string | undefined;
  try {
    await runCommand(
      process.execPath,
      [vitest, 'run', '--reporter=default', '--reporter=json', `--outputFile.json=${report}`, ...args],
      { cwd: projectRoot, env: { ...stackEnvironment(profile), WHORLWIND_TEST_STACK: '1' } },
    );
  } catch (failure) {
    error = (failure as Error).message;
  }
  const counts = await readJsonReport<{ numPassedTests: number; numFailedTests: number }>(report, (json) => ({
    passed: json.numPassedTests,
    failed: json.numFailedTests,
  }));
  return { phase: 'vitest', ...counts, error: error ?? counts.error };
}

async function runBrowserTests(profile: StackProfile, args: string[]): Promise<Tally> {
  await ensureChromium();
  await buildApp(profile);
  // The browser tests meet the app as people do: the server answers, job workers beside it make
  // exports, thumbnails and listing pictures (TEST_WORKERS=n for more).
  startJobWorkers(profile);
  await startApp(profile);
  const report = join(reportDir, 'playwright.json');
  await rm(report, { force: true });
  const playwright = join(projectRoot, 'node_modules', '@playwright', 'test', 'cli.js');
  let error: string | undefined;
  try {
    await runCommand(process.execPath, [playwright, 'test', '--reporter=list,json', ...args], {
      cwd: projectRoot,
      env: {
        ...stackEnvironment(profile),
        PLAYWRIGHT_JSON_OUTPUT_NAME: report,
        WHORLWIND_BASE_URL: `http://127.0.0.1:${profile.ports.app}`,
      },
    });
  } catch (failure) {
    error = (failure as Error).message;
  }
  type PlaywrightStats = { stats: { expected: number; flaky: number; unexpected: number } };
  const counts = await readJsonReport<PlaywrightStats>(report, (json) => ({
    passed: json.stats.expected + json.stats.flaky,
    failed: json.stats.unexpected,
  }));
  return { phase: 'browser', ...counts, error: error ?? counts.error };
}

async function readJsonReport<Report>(
  file: string,
  count: (json: Report) => { passed: number; failed: number },
): Promise<{ passed: number; failed: number; error?: string }> {
  try {
    return count(JSON.parse(await readFile(file, 'utf8')) as Report);
  } catch {
    return { passed: 0, failed: 0, error: `no report was written to ${file}` };
  }
}

stopEverythingOnSignals();
const [only, ...passThrough] = process.argv.slice(2);
if (only !== undefined && only !== 'vitest' && only !== 'browser') {
  console.error(`Unknown phase "${only}": use "vitest" or "browser", or nothing for all phases.`);
  process.exit(2);
}

const profile = testProfile();
const tallies: Tally[] = [];
try {
  await mkdir(reportDir, { recursive: true });
  if (only === undefined) tallies.push(await runTypeCheck());
  await startStack(profile);
  await migrateAndSeed(profile);
  if (only !== 'browser') tallies.push(await runVitest(profile, only === 'vitest' ? passThrough : []));
  if (only !== 'vitest') {
    try {
      tallies.push(await runBrowserTests(profile, only === 'browser' ? passThrough : []));
    } catch (failure) {
      tallies.push({ phase: 'browser', passed: 0, failed: 0, error: (failure as Error).message });
    }
  }
} catch (failure) {
  tallies.push({ phase: 'set-up', passed: 0, failed: 0, error: (failure as Error).message });
}
await shutdown();

let failedPhases = 0;
for (const tally of tallies) {
  const trouble = tally.error || tally.failed > 0;
  if (trouble) failedPhases += 1;
  console.log(`[whorlwind] ${tally.phase}: ${tally.passed} passed, ${tally.failed} failed${tally.error ? ` — ${tally.error.split('\n')[0]}` : ''}`);
}
const passed = tallies.reduce((sum, tally) => sum + tally.passed, 0);
const failed = tallies.reduce((sum, tally) => sum + tally.failed, 0);
console.log(`tests: ${passed} passed, ${failed} failed`);
process.exit(failedPhases > 0 ? 1 : 0);
