// The editor's opening in four stages, as the groomer sees them: the surface's download, its
// reading, the solver's one-off preparation, and the first solve of the field. The worker reports
// what it is doing in words (ProgressReport.stage); this names the stage each report belongs to and
// keeps when each began and ended, so the page can show a line per stage with its time.

export const OPENING_STAGES = ['download', 'read', 'prepare', 'solve'] as const;
export type OpeningStage = (typeof OPENING_STAGES)[number];

export const OPENING_STAGE_LABELS: Record<OpeningStage, string> = {
  download: 'Download the surface',
  read: 'Read it',
  prepare: 'Prepare the field solver',
  solve: 'Solve the field',
};

export type OpeningStages = Partial<Record<OpeningStage, { readonly startedAt: number; readonly endedAt: number | null }>>;

/** The stage a progress report of the opening belongs to, by the worker's words; null for none of them. */
export function stageOfReport(stage: string): OpeningStage | null {
  if (stage.startsWith('downloading')) return 'download';
  if (stage.startsWith('reading')) return 'read';
  if (stage.startsWith('preparing') || stage === 'surface prepared') return 'prepare';
  if (stage.startsWith('solving')) return 'solve';
  return null;
}

/**
 * The stages after `stage` began at `at`. Guarantees: stages only move forward — every earlier
 * stage still open ends at `at`, a stage already begun keeps its start, and a report of an earlier
 * stage (the file read after its prepared form failed) reopens nothing that came after it.
 */
export function enterStage(stages: OpeningStages, stage: OpeningStage, at: number): OpeningStages {
  const order = OPENING_STAGES.indexOf(stage);
  if (OPENING_STAGES.some((later, i) => i > order && stages[later])) return stages;
  // Entering a stage ended the ones before it: a stage still open needs nothing more.
  if (stages[stage] && stages[stage]!.endedAt === null) return stages;
  const next: OpeningStages = { ...stages };
  for (const [i, earlier] of OPENING_STAGES.entries()) {
    if (i < order && next[earlier] && next[earlier]!.endedAt === null) next[earlier] = { ...next[earlier]!, endedAt: at };
  }
  next[stage] = { startedAt: next[stage]?.startedAt ?? at, endedAt: null };
  return next;
}

/** The stages with `stage` ended at `at` (begun then, when it had not begun). */
export function endStage(stages: OpeningStages, stage: OpeningStage, at: number): OpeningStages {
  const entered = enterStage(stages, stage, stages[stage]?.startedAt ?? at);
  const current = entered[stage];
  if (!current || current.endedAt !== null) return entered;
  return { ...entered, [stage]: { ...current, endedAt: at } };
}
