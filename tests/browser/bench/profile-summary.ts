// What a V8 CPU profile (Chrome DevTools Protocol, Profiler.stop) says in a few lines: the
// functions with the most self time, each with its script and line.

/** The parts of a `Profiler.Profile` read here (https://chromedevtools.github.io/devtools-protocol/tot/Profiler/#type-Profile). */
export interface CpuProfile {
  nodes: { id: number; callFrame: { functionName: string; url: string; lineNumber: number; columnNumber: number }; hitCount?: number }[];
  startTime: number;
  endTime: number;
  samples?: number[];
  timeDeltas?: number[];
}

export interface SelfTimeEntry {
  /** Function name (or V8's "(garbage collector)", "(program)", "(idle)"), script file and line (1-based). */
  readonly name: string;
  readonly where: string;
  readonly selfMilliseconds: number;
  readonly share: number;
}

/**
 * The `count` entries with the most self time, samples of the same function in the same place
 * added up. Each sample's time is the gap to the next sample (timeDeltas), as DevTools counts it;
 * `share` is of the profile's whole span.
 */
export function topSelfTime(profile: CpuProfile, count: number): SelfTimeEntry[] {
  const byNode = new Map(profile.nodes.map((node) => [node.id, node]));
  const self = new Map<number, number>();
  const samples = profile.samples ?? [];
  const deltas = profile.timeDeltas ?? [];
  for (let i = 0; i < samples.length; i++) {
    const ms = (deltas[i + 1] ?? 0) / 1000;
    self.set(samples[i], (self.get(samples[i]) ?? 0) + ms);
  }
  const grouped = new Map<string, { name: string; where: string; ms: number }>();
  for (const [id, ms] of self) {
    const frame = byNode.get(id)!.callFrame;
    const file = frame.url ? frame.url.replace(/^.*\//, '').replace(/\?.*$/, '') : '';
    const where = file ? `${file}:${frame.lineNumber + 1}` : '';
    const name = frame.functionName || '(anonymous)';
    const key = `${name} ${where}`;
    const entry = grouped.get(key) ?? { name, where, ms: 0 };
    entry.ms += ms;
    grouped.set(key, entry);
  }
  const span = (profile.endTime - profile.startTime) / 1000;
  return [...grouped.values()]
    .sort((a, b) => b.ms - a.ms)
    .slice(0, count)
    .map((e) => ({ name: e.name, where: e.where, selfMilliseconds: Math.round(e.ms), share: Math.round((1000 * e.ms) / span) / 1000 }));
}
