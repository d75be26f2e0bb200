// Opening a growth surface in the field worker: its bytes fetched (with progress) or taken from
// the page or a demo character, and the prepared surface described for the page, which draws it
// and points at it without a second reading of the file.
import { FieldError, type TriangleMesh } from '@/lib/field';
import type { GroomSurface } from '@/lib/groom';
import { DEMO_GROOMS } from '@/lib/groom/demo';
import type { OpenedSurface, ProgressReport, SurfacePreview, SurfaceSource } from './protocol';
import { surfaceBounds } from './surface-geometry';

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
  // A report per whole per cent (or per megabyte when the size is unknown): each one re-renders the page.
  let reported = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    chunks.push(value);
    received += value.length;
    const step = total > 0 ? Math.floor((100 * received) / total) : Math.floor(received / 1e6);
    if (step > reported) {
      reported = step;
      progress({ stage: 'downloading the surface', fraction: total > 0 ? Math.min(1, received / total) : null });
    }
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
 * The surface as read, for the page to draw before the preparation (see SurfacePreview). Linear in
 * the size; fresh arrays, so they can be transferred to the page. Guarantees: the same triangles
 * and positions (rounded to single precision), and the centre and radius `describeSurface` gives
 * the prepared surface (the middle of the bounding box and half its diagonal).
 */
export function previewOf(mesh: TriangleMesh): SurfacePreview {
  const p = mesh.positions;
  const t = mesh.triangles;
  const normals = new Float32Array(p.length);
  for (let f = 0; f < t.length; f += 3) {
    const a = 3 * t[f], b = 3 * t[f + 1], c = 3 * t[f + 2];
    const ux = p[b] - p[a], uy = p[b + 1] - p[a + 1], uz = p[b + 2] - p[a + 2];
    const vx = p[c] - p[a], vy = p[c + 1] - p[a + 1], vz = p[c + 2] - p[a + 2];
    // The cross product's length is twice the area: larger faces weigh more.
    const nx = uy * vz - uz * vy, ny = uz * vx - ux * vz, nz = ux * vy - uy * vx;
    for (const v of [a, b, c]) {
      normals[v] += nx;
      normals[v + 1] += ny;
      normals[v + 2] += nz;
    }
  }
  for (let v = 0; v < normals.length; v += 3) {
    const length = Math.hypot(normals[v], normals[v + 1], normals[v + 2]);
    if (length > 0) for (let k = 0; k < 3; k++) normals[v + k] /= length;
  }
  const { center, radius } = surfaceBounds(p);
  return { positions: Float32Array.from(p), triangles: t.slice(), vertexNormals: normals, vertexCount: p.length / 3, faceCount: t.length / 3, center, radius };
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
    // Copies: the worker's skin keeps walking its own.
    pickHierarchy: { roots: surface.skin.hierarchy.roots.map((root) => root.slice(0)), indirectBuffer: surface.skin.hierarchy.indirectBuffer.slice() },
  };
}
