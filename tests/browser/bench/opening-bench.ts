// Benchmark of opening the studio editor in Debian's Chromium on UV spheres of about 50,000,
// 200,000 and 1,000,000 faces (issue 15, items 1, 2 and 5):
//  - time from navigation start to the first picture of the surface (`whorlwind:surface-shown`,
//    when the page marks it) and to the first frame that shows the solved field
//    (`whorlwind:first-field`), three openings per size, with the worker's own timings per stage;
//  - the progress lines the page showed while opening (read from the page every 50 ms), and the
//    longest task on the page's main thread while opening (Long Tasks API: a frozen page shows as
//    one long task);
//  - the same preparation (`prepareGroomSurface`, what the worker runs) in Node in this process, on
//    the same surface, for the worker-against-Node ratio;
//  - at 50k faces a fourth, profiled opening: CPU profiles of the page and of the field worker
//    (Chrome DevTools Protocol: the worker attached with Target.setAutoAttach, its Profiler driven
//    through Target.sendMessageToTarget), their top self-time entries printed and written out.
// Targets: first field ≤ 2.5 s at 50k (cold ≤ 3 s), ≤ 6 s at 200k, ≤ 20 s at 1M with the stages shown.
// Run (quiet machine: the quiet lock held exclusively):
//   npm test -- browser --config tests/browser/bench/playwright.config.ts --grep opening
// Figures go to .data/test-reports/opening-bench-<faces>.json, profiles beside them.
import { mkdirSync, writeFileSync } from 'node:fs';
import { availableParallelism, loadavg } from 'node:os';
import { performance as nodePerformance } from 'node:perf_hooks';
import { expect, test, type CDPSession, type Page } from '@playwright/test';
import { closeDb } from '../../../lib/platform/db';
import { readSurface, prepareSurface } from '../../../lib/field';
import { prepareGroomSurface } from '../../../lib/groom';
import { confirmedAccount, signInThroughForm } from '../helpers';
import { waitForField } from '../studio-helpers';
import { topSelfTime, type CpuProfile } from './profile-summary';
import { serverIdle, sphereGroom, sphereObj } from './bench-groom';

test.afterAll(closeDb);

const OPENINGS = 3;
const REPORTS = '.data/test-reports';

/** Records, from the document's start, the opening's progress lines and the main thread's long tasks. */
function watchOpening() {
  const w = window as unknown as { __opening: { lines: { at: number; text: string }[]; longTasks: { at: number; ms: number }[] } };
  w.__opening = { lines: [], longTasks: [] };
  try {
    new PerformanceObserver((list) => {
      for (const entry of list.getEntries()) w.__opening.longTasks.push({ at: Math.round(entry.startTime), ms: Math.round(entry.duration) });
    }).observe({ type: 'longtask', buffered: true });
  } catch {
    // No Long Tasks API: the record stays empty.
  }
  setInterval(() => {
    // The bar's label, and the stage line that is running (when the page shows them).
    const box = document.querySelector('[data-testid="opening-progress"]');
    const label = box?.querySelector('[role="progressbar"]')?.getAttribute('aria-label');
    const running = box?.querySelector('[data-state="running"]')?.getAttribute('data-stage');
    const text = box ? `${label ?? box.textContent?.slice(0, 60)}${running ? ` [${running}]` : ''}` : null;
    const lines = w.__opening.lines;
    if (text && lines[lines.length - 1]?.text !== text) lines.push({ at: Math.round(performance.now()), text });
  }, 50);
}

async function openingFigures(page: Page) {
  return page.evaluate(() => {
    const at = (name: string) => performance.getEntriesByName(name)[0] as PerformanceMark | undefined;
    const opened = at('whorlwind:surface-opened');
    const solved = at('whorlwind:first-solve');
    const firstField = at('whorlwind:first-field')?.startTime ?? NaN;
    const w = window as unknown as { __opening: { lines: { at: number; text: string }[]; longTasks: { at: number; ms: number }[] } };
    const during = w.__opening.longTasks.filter((t) => t.at <= firstField);
    return {
      firstField: Math.round(firstField),
      surfaceShown: Math.round(at('whorlwind:surface-shown')?.startTime ?? NaN),
      editorMounted: Math.round(at('whorlwind:editor-mounted')?.startTime ?? NaN),
      workerWorking: Math.round(at('whorlwind:worker-working')?.startTime ?? NaN),
      surfaceOpened: Math.round(opened?.startTime ?? NaN),
      downloadMilliseconds: Math.round(opened?.detail?.downloadMilliseconds ?? NaN),
      readMilliseconds: Math.round(opened?.detail?.readMilliseconds ?? NaN),
      prepareMilliseconds: Math.round(opened?.detail?.prepareMilliseconds ?? NaN),
      firstSolveReceived: Math.round(solved?.startTime ?? NaN),
      firstSolveMilliseconds: Math.round(solved?.detail?.milliseconds ?? NaN),
      longestMainThreadTask: during.reduce((m, t) => Math.max(m, t.ms), 0),
      mainThreadLongTaskTotal: during.reduce((s, t) => s + t.ms, 0),
      // Each long task's start (ms from navigation) and length, to tell which stage it belongs to.
      longTasks: during,
      progressLines: w.__opening.lines,
    };
  });
}

/** CPU profiles of the page and of every worker it starts, from before navigation until `stop`. */
async function profileOpening(page: Page): Promise<{ stop(): Promise<{ page: CpuProfile; workers: { url: string; profile: CpuProfile }[] }> }> {
  const cdp: CDPSession = await page.context().newCDPSession(page);
  let next = 1;
  const answers = new Map<number, (message: { result?: unknown; error?: unknown }) => void>();
  const workers: { sessionId: string; url: string }[] = [];
  const toWorker = (sessionId: string, method: string, params: object = {}) =>
    new Promise<{ result?: unknown; error?: unknown }>((resolve) => {
      const id = next++;
      answers.set(id, resolve);
      void cdp.send('Target.sendMessageToTarget', { sessionId, message: JSON.stringify({ id, method, params }) });
    });
  cdp.on('Target.receivedMessageFromTarget', (event) => {
    const message = JSON.parse(event.message);
    if (message.id && answers.has(message.id)) {
      answers.get(message.id)!(message);
      answers.delete(message.id);
    }
  });
  cdp.on('Target.attachedToTarget', async (event) => {
    if (event.targetInfo.type !== 'worker') {
      if (event.waitingForDebugger) await toWorker(event.sessionId, 'Runtime.runIfWaitingForDebugger');
      return;
    }
    workers.push({ sessionId: event.sessionId, url: event.targetInfo.url });
    await toWorker(event.sessionId, 'Profiler.enable');
    await toWorker(event.sessionId, 'Profiler.setSamplingInterval', { interval: 200 });
    await toWorker(event.sessionId, 'Profiler.start');
    await toWorker(event.sessionId, 'Runtime.runIfWaitingForDebugger');
  });
  await cdp.send('Profiler.enable');
  await cdp.send('Profiler.setSamplingInterval', { interval: 200 });
  await cdp.send('Profiler.start');
  // Workers wait for the profiler before running their first line.
  await cdp.send('Target.setAutoAttach', { autoAttach: true, waitForDebuggerOnStart: true, flatten: false });
  return {
    async stop() {
      const pageProfile = (await cdp.send('Profiler.stop')).profile as unknown as CpuProfile;
      const workerProfiles = [];
      for (const worker of workers) {
        const answer = await toWorker(worker.sessionId, 'Profiler.stop');
        const profile = (answer.result as { profile?: CpuProfile } | undefined)?.profile;
        if (profile) workerProfiles.push({ url: worker.url, profile });
      }
      await cdp.send('Target.setAutoAttach', { autoAttach: false, waitForDebuggerOnStart: false, flatten: false });
      await cdp.detach();
      return { page: pageProfile, workers: workerProfiles };
    },
  };
}

const median = (values: number[]) => [...values].sort((a, b) => a - b)[Math.floor(values.length / 2)];

async function benchOpening(page: Page, rings: number, segments: number, profile: boolean) {
  const { mesh, faces, obj } = sphereObj(rings, segments, "studio's opening benchmark");

  // The same preparation in Node, on the surface as the server reads it: twice (the first warms the engine up).
  const read = readSurface(new Uint8Array(obj), 'sphere.obj').mesh;
  const node: { prepareGroomSurface: number[]; prepareSurface: number[] } = { prepareGroomSurface: [], prepareSurface: [] };
  for (let i = 0; i < 2; i++) {
    let t = nodePerformance.now();
    prepareGroomSurface(read, { boundary: 'free' });
    node.prepareGroomSurface.push(Math.round(nodePerformance.now() - t));
    t = nodePerformance.now();
    prepareSurface(read, { boundary: 'free' });
    node.prepareSurface.push(Math.round(nodePerformance.now() - t));
  }

  const account = await confirmedAccount(`opening${faces}`, 'groomer', 'a-proper-coat-42');
  await signInThroughForm(page, account.email, account.password);
  await expect(page.getByTestId('signed-in-as')).toBeVisible();
  const { groomId } = await sphereGroom(page, obj, faces, 'Opening bench');
  await page.addInitScript(watchOpening);
  const timeout = Math.max(120_000, faces * 0.3);
  const openings = [];
  await serverIdle();
  for (let i = 0; i < OPENINGS + (profile ? 1 : 0); i++) {
    const profiler = i === OPENINGS ? await profileOpening(page) : null;
    await page.goto(`/studio/grooms/${groomId}`);
    await waitForField(page, timeout);
    if (profiler) {
      const profiles = await profiler.stop();
      mkdirSync(REPORTS, { recursive: true });
      writeFileSync(`${REPORTS}/opening-${faces}-page.cpuprofile`, JSON.stringify(profiles.page));
      const worker = profiles.workers.find((w) => w.url.includes('field')) ?? profiles.workers[0];
      if (worker) writeFileSync(`${REPORTS}/opening-${faces}-worker.cpuprofile`, JSON.stringify(worker.profile));
      const summary = { page: topSelfTime(profiles.page, 20), worker: worker ? { url: worker.url, top: topSelfTime(worker.profile, 20) } : null, workers: profiles.workers.map((w) => w.url) };
      console.log(`profile of a ${faces}-face opening:\n${JSON.stringify(summary, null, 1)}`);
      writeFileSync(`${REPORTS}/opening-${faces}-profile.json`, `${JSON.stringify({ figures: await openingFigures(page), ...summary }, null, 2)}\n`);
    } else {
      openings.push(await openingFigures(page));
    }
    // Leave the page before the next opening, so its guide growth does not overlap it.
    await page.goto('/studio');
  }
  const result = {
    when: new Date().toISOString(),
    surface: { faces, vertices: mesh.positions.length / 3, objBytes: obj.byteLength },
    firstFieldMedian: median(openings.map((o) => o.firstField)),
    surfaceShownMedian: median(openings.map((o) => o.surfaceShown)),
    workerPrepareMedian: median(openings.map((o) => o.prepareMilliseconds)),
    node,
    openings,
    machine: { cores: availableParallelism(), loadAverage: loadavg().map((x) => Math.round(x * 100) / 100) },
  };
  console.log(JSON.stringify(result, null, 2));
  mkdirSync(REPORTS, { recursive: true });
  writeFileSync(`${REPORTS}/opening-bench-${faces}.json`, `${JSON.stringify(result, null, 2)}\n`);
}

test('opening the editor on 50k faces (profiled)', async ({ page }) => {
  test.setTimeout(900_000);
  await benchOpening(page, 158, 160, true);
});

test('opening the editor on 200k faces', async ({ page }) => {
  test.setTimeout(1_200_000);
  await benchOpening(page, 314, 320, false);
});

test('opening the editor on 1M faces', async ({ page }) => {
  test.setTimeout(2_400_000);
  await benchOpening(page, 696, 720, false);
});
