// Child processes and shutdown for the task scripts (demo, dev, test).
// Every child runs in its own process group, so that stopping it also stops whatever it
// spawned (next start's workers, Chromium under Playwright). Teardown steps run in the reverse
// order of registration, once, whether the task ends normally, fails or is interrupted.
import { spawn, type ChildProcess, type SpawnOptions } from 'node:child_process';

type Teardown = { label: string; run: () => Promise<void> | void };

const teardowns: Teardown[] = [];
const running = new Set<ChildProcess>();
let shuttingDown: Promise<void> | null = null;

export function log(message: string) {
  console.log(`[whorlwind] ${message}`);
}

export function onShutdown(label: string, run: Teardown['run']) {
  teardowns.push({ label, run });
}

export function isShuttingDown() {
  return shuttingDown !== null;
}

/** Runs the registered teardown steps (last registered first) exactly once. */
export function shutdown(): Promise<void> {
  shuttingDown ??= (async () => {
    for (const child of running) await stopProcessGroup(child);
    while (teardowns.length > 0) {
      const step = teardowns.pop()!;
      try {
        await step.run();
      } catch (error) {
        console.error(`[whorlwind] stopping ${step.label} failed:`, error);
      }
    }
  })();
  return shuttingDown;
}

/** Ctrl-C, SIGTERM and SIGHUP stop everything the task started, then end the process. */
export function stopEverythingOnSignals() {
  for (const signal of ['SIGINT', 'SIGTERM', 'SIGHUP'] as const) {
    process.on(signal, () => {
      if (shuttingDown) return;
      log(`${signal} received: stopping everything this run started…`);
      void shutdown().then(() => process.exit(signal === 'SIGINT' ? 130 : 143));
    });
  }
}

export class CommandFailed extends Error {}

type CommandOptions = {
  env?: NodeJS.ProcessEnv;
  cwd?: string;
  quiet?: boolean;
  /** Teardown steps run commands too; everything else must not start once shutdown began. */
  duringShutdown?: boolean;
};

function spawnTracked(command: string, args: string[], options: CommandOptions): ChildProcess {
  if (shuttingDown && !options.duringShutdown) throw new CommandFailed(`not starting ${command}: shutting down`);
  const spawnOptions: SpawnOptions = {
    cwd: options.cwd,
    env: options.env ?? process.env,
    stdio: options.quiet ? ['ignore', 'pipe', 'pipe'] : ['ignore', 'inherit', 'inherit'],
    detached: true,
  };
  const child = spawn(command, args, spawnOptions);
  running.add(child);
  child.on('exit', () => running.delete(child));
  return child;
}

/** Runs a command to its end; rejects with its output (when quiet) if it exits non-zero. */
export function runCommand(command: string, args: string[], options: CommandOptions = {}): Promise<string> {
  return new Promise((resolve, reject) => {
    let child: ChildProcess;
    try {
      child = spawnTracked(command, args, options);
    } catch (error) {
      reject(error);
      return;
    }
    let output = '';
    child.stdout?.on('data', (chunk) => (output += chunk));
    child.stderr?.on('data', (chunk) => (output += chunk));
    child.on('error', (error) => reject(new CommandFailed(`${command} could not start: ${error.message}`)));
    child.on('exit', (code, signal) => {
      if (code === 0) resolve(output);
      else {
        const how = signal ? `was stopped by ${signal}` : `exited with code ${code}`;
        reject(new CommandFailed(`${[command, ...args].join(' ')} ${how}${output ? `\n${output}` : ''}`));
      }
    });
  });
}

export type LongRunning = { child: ChildProcess; exited: Promise<number> };

/** Starts a server process that keeps running until shutdown. */
export function startProcess(command: string, args: string[], options: CommandOptions = {}): LongRunning {
  const child = spawnTracked(command, args, options);
  const exited = new Promise<number>((resolve) => child.on('exit', (code) => resolve(code ?? 1)));
  return { child, exited };
}

async function stopProcessGroup(child: ChildProcess) {
  if (child.exitCode !== null || child.signalCode !== null || child.pid === undefined) return;
  const exited = new Promise<void>((resolve) => child.once('exit', () => resolve()));
  const signalGroup = (signal: NodeJS.Signals) => {
    try {
      process.kill(-child.pid!, signal);
    } catch {
      // The group is already gone.
    }
  };
  signalGroup('SIGTERM');
  const stillRunning = await Promise.race([
    exited.then(() => false),
    new Promise<boolean>((resolve) => setTimeout(() => resolve(true), 10_000)),
  ]);
  if (stillRunning) {
    signalGroup('SIGKILL');
    await exited;
  }
}

/** Waits until an HTTP URL answers with a status below 500, or the process behind it exits. */
export async function waitForHttp(url: string, server: LongRunning, what: string) {
  let serverExited = false;
  void server.exited.then(() => (serverExited = true));
  for (;;) {
    if (serverExited) throw new CommandFailed(`${what} exited before it answered at ${url}`);
    if (shuttingDown) throw new CommandFailed(`stopped while waiting for ${what}`);
    try {
      const response = await fetch(url, { signal: AbortSignal.timeout(5_000) });
      if (response.status < 500) return;
    } catch {
      // Not listening yet.
    }
    await new Promise((resolve) => setTimeout(resolve, 300));
  }
}
