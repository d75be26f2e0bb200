// Growth surfaces kept ready in this process. Preparing a surface (the field engine's
// factorization, the skin's hierarchy) is the expensive step of every solve, and a stored surface
// never changes, so the last few are kept by id: the next export or thumbnail of the same groom
// only solves and traces.
import { readSurface, type BoundaryMode, type TriangleMesh } from '../field';
import { prepareGroomSurface, type GroomSurface } from '../groom';
import { getObjectBytes } from '../platform/storage';

/** Surfaces kept; each holds its mesh and one prepared surface per boundary mode used. */
const CACHED_SURFACES = 3;

export type StoredSurfaceFile = { id: string; objectKey: string; fileName: string };

type Entry = { mesh: Promise<TriangleMesh>; prepared: Map<BoundaryMode, GroomSurface> };

const entries = new Map<string, Entry>();

/** The entry of a surface, marked as the most recently used; the least recently used goes. */
function entryFor(surface: StoredSurfaceFile, load: () => Promise<TriangleMesh>): Entry {
  let entry = entries.get(surface.id);
  if (entry) {
    entries.delete(surface.id);
  } else {
    const mesh = load();
    entry = { mesh, prepared: new Map() };
    // A failed read must not stay cached: the next call tries again.
    mesh.catch(() => {
      if (entries.get(surface.id)?.mesh === mesh) entries.delete(surface.id);
    });
  }
  entries.set(surface.id, entry);
  while (entries.size > CACHED_SURFACES) entries.delete(entries.keys().next().value!);
  return entry;
}

async function readStoredSurface(surface: StoredSurfaceFile): Promise<TriangleMesh> {
  return readSurface(await getObjectBytes(surface.objectKey), surface.fileName).mesh;
}

/** Keeps a mesh just read (at upload) so that the first groom on it need not read it again. */
export function rememberSurfaceMesh(surface: StoredSurfaceFile, mesh: TriangleMesh): void {
  entryFor(surface, () => Promise.resolve(mesh));
}

/** The surface's mesh as the field engine reads it from the stored file. */
export function surfaceMesh(surface: StoredSurfaceFile): Promise<TriangleMesh> {
  return entryFor(surface, () => readStoredSurface(surface)).mesh;
}

/** True when the surface is prepared for this boundary mode in this process already. */
export function isSurfacePrepared(surfaceId: string, boundary: BoundaryMode): boolean {
  return entries.get(surfaceId)?.prepared.has(boundary) ?? false;
}

/** The surface prepared for grooming with the given boundary mode, prepared once per process. */
export async function preparedSurface(surface: StoredSurfaceFile, boundary: BoundaryMode): Promise<GroomSurface> {
  const entry = entryFor(surface, () => readStoredSurface(surface));
  const mesh = await entry.mesh;
  let prepared = entry.prepared.get(boundary);
  if (!prepared) {
    prepared = prepareGroomSurface(mesh, { boundary });
    entry.prepared.set(boundary, prepared);
  }
  return prepared;
}
