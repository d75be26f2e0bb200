// The server's path from a saved spec to a field and guides, shared by exports and thumbnails:
// the surface comes from this process's cache of prepared surfaces, and each long step is
// announced first, so that a job can show where it is.
import type { SolvedField } from '../field';
import { growGuides, parseGroomSpec, solveGroomField, type GroomSpec, type GroomSurface, type GrowOptions, type Guides } from '../groom';
import { isSurfacePrepared, preparedSurface, type StoredSurfaceFile } from './surface-cache';

/** The steps, in plain words for the groomer, and how far along each starts (0–1). */
export const GROW_STAGES = {
  preparing: { stage: 'preparing the surface', progress: 0.05 },
  solving: { stage: 'solving the field', progress: 0.35 },
  tracing: { stage: 'tracing guides', progress: 0.55 },
} as const;

export type StageReport = (step: { stage: string; progress: number }) => Promise<void>;

export type SolvedSpec = { spec: GroomSpec; surface: GroomSurface; solved: SolvedField };

/**
 * Solves a stored spec on its surface. Throws lib/groom's GroomError or lib/field's FieldError,
 * in plain words, when the spec does not fit the surface or cannot be solved.
 */
export async function solveStoredSpec(storedSpec: unknown, surfaceFile: StoredSurfaceFile, report: StageReport): Promise<SolvedSpec> {
  const spec = parseGroomSpec(storedSpec);
  // Preparing is announced only when it will really happen; a cached surface goes straight on.
  if (!isSurfacePrepared(surfaceFile.id, spec.field.boundary)) await report(GROW_STAGES.preparing);
  const surface = await preparedSurface(surfaceFile, spec.field.boundary);
  await report(GROW_STAGES.solving);
  return { spec, surface, solved: solveGroomField(spec, surface) };
}

/** Solves a stored spec and grows its guides, or a sample of them (see solveStoredSpec for the failures). */
export async function growStoredSpec(storedSpec: unknown, surfaceFile: StoredSurfaceFile, report: StageReport, options: GrowOptions = {}): Promise<SolvedSpec & { guides: Guides }> {
  const solved = await solveStoredSpec(storedSpec, surfaceFile, report);
  await report(GROW_STAGES.tracing);
  return { ...solved, guides: growGuides(solved.surface, solved.solved, solved.spec, options).guides };
}
