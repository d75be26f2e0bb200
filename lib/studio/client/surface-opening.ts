// Opening a growth surface in the field worker: its bytes fetched (with progress) or taken from
// the page or a demo character, and the prepared surface described for the page, which draws it
// and points at it without a second reading of the file.
import { FieldError, type TriangleMesh } from '@/lib/field';
import type { GroomSurface } from '@/lib/groom';
import { DEMO_GROOMS } from '@/lib/groom/demo';
import type { OpenedSurface, ProgressReport, SurfaceSource } from './protocol';

/** The bytes of a surface source, with download progress. */
export async function loadSurfaceBytes(source: SurfaceSource, progress: (report: ProgressReport) => void): Promise<{ bytes: Uint8Array; fileName: string } | { mesh: TriangleMesh; fileName: string }> {
  if (source.kind === 'bytes') return { bytes: new Uint8Array(source.bytes), fileName: source.fileName };
  if (source.kind === 'demo') {
    const demo = DEMO_GROOMS.find((groom) => groom.id === source.demoId);
    if (!demo) throw new FieldError('unknown-demo', `There is no demo character "${source.demoId}".`);
    return { mesh: demo.surface(), fileName: `${demo.id}.obj` };
  }
  progress({ stage: 'downloading the surface', fraction: 0 });
  let response: Response;
  try {
    response = await fetch(source.url);
  } catch {
    throw new FieldError('download-failed', 'The surface file could not be downloaded: the file store did not answer. Check the connection and reload the page.');
  }
  if (!response.ok || !response.body) {
    throw new FieldError('download-failed', `The surface file could not be downloaded (the file store answered ${response.status}). Reload the page to get a fresh link.`);
  }
  const total = Number(response.headers.get('content-length')) || 0;
  const reader = response.body.getReader();
  const chunks: Uint8Array[] = [];
  let received = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    chunks.push(value);
    received += value.length;
    progress({ stage: 'downloading the surface', fraction: total > 0 ? Math.min(1, received / total) : null });
  }
  const bytes = new Uint8Array(received);
  let at = 0;
  for (const chunk of chunks) {
    bytes.set(chunk, at);
    at += chunk.length;
  }
  return { bytes, fileName: source.fileName };
}

/**
 * What the page needs of a prepared surface: copies of its arrays (the worker keeps its own), its
 * pieces, border, groups and size. The centre is the middle of the bounding box.
 */
export function describeSurface(surface: GroomSurface, fileVertexCount: number, timings: OpenedSurface['timings']): OpenedSurface {
  const { mesh, field } = surface;
  const topology = field.topology;
  const p = mesh.positions;
  const boundary: number[] = [];
  for (const loop of topology.boundaryLoops) {
    for (const h of loop) {
      const a = topology.triangles[h];
      const b = topology.triangles[h % 3 === 2 ? h - 2 : h + 1];
      boundary.push(p[3 * a], p[3 * a + 1], p[3 * a + 2], p[3 * b], p[3 * b + 1], p[3 * b + 2]);
    }
  }
  let cx = 0, cy = 0, cz = 0;
  const min = [Infinity, Infinity, Infinity], max = [-Infinity, -Infinity, -Infinity];
  for (let v = 0; v < p.length / 3; v++) {
    for (let k = 0; k < 3; k++) {
      min[k] = Math.min(min[k], p[3 * v + k]);
      max[k] = Math.max(max[k], p[3 * v + k]);
    }
  }
  cx = (min[0] + max[0]) / 2;
  cy = (min[1] + max[1]) / 2;
  cz = (min[2] + max[2]) / 2;
  return {
    vertexCount: topology.vertexCount,
    faceCount: topology.faceCount,
    fileVertexCount,
    positions: p.slice(),
    triangles: mesh.triangles.slice(),
    vertexNormals: Float32Array.from(surface.vertexNormal),
    componentOfVertex: field.componentOfVertex.slice(),
    components: field.components.map((c) => ({ faceCount: c.faceCount, eulerCharacteristic: c.eulerCharacteristic, boundaryLoopCount: c.boundaryLoopCount, genus: c.genus })),
    boundaryLines: Float32Array.from(boundary),
    groups: mesh.groups?.names.slice() ?? [],
    center: [cx, cy, cz],
    radius: surface.diagonal / 2,
    diagonal: surface.diagonal,
    meanEdge: surface.meanEdge,
    boundary: field.boundary,
    timings,
  };
}
