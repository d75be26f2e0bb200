// The spec a new groom starts from: on every closed piece of the surface, singularities whose
// indices add up to its Euler characteristic (Poincaré–Hopf), placed as far apart as the piece
// allows — two whorls at the ends of a head or body, none on a ring, saddles on a surface with
// several handles. Pieces with a boundary need nothing (the boundary is free).
import { buildTopology, componentFacts, type TriangleMesh } from '../field';
import { parseGroomSpec, type GroomSpec, type Unit } from '../groom';

/** Guides per cm² of a new groom, before the count limits below. */
const STARTING_DENSITY = 1;
/** A new groom grows at least this many guides (on small surfaces) and at most this many (on large ones). */
const STARTING_GUIDES = { fewest: 200, most: 5000 } as const;
/** The spec's own bound on density. */
const MAX_DENSITY = 10_000;

/**
 * `count` vertices of `vertices` spread by farthest-point sampling: first the one farthest from
 * their centroid, then each time the one farthest from all chosen so far.
 */
export function spreadVertices(positions: Float64Array, vertices: readonly number[], count: number): number[] {
  const n = vertices.length;
  if (count <= 0 || n === 0) return [];
  let cx = 0, cy = 0, cz = 0;
  for (const v of vertices) {
    cx += positions[3 * v];
    cy += positions[3 * v + 1];
    cz += positions[3 * v + 2];
  }
  cx /= n; cy /= n; cz /= n;
  // Squared distance of each candidate to the nearest chosen vertex (to the centroid at first).
  const nearest = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const v = vertices[i];
    nearest[i] = (positions[3 * v] - cx) ** 2 + (positions[3 * v + 1] - cy) ** 2 + (positions[3 * v + 2] - cz) ** 2;
  }
  const chosen: number[] = [];
  while (chosen.length < Math.min(count, n)) {
    let best = 0;
    for (let i = 1; i < n; i++) if (nearest[i] > nearest[best]) best = i;
    const b = vertices[best];
    chosen.push(b);
    for (let i = 0; i < n; i++) {
      const v = vertices[i];
      const d = (positions[3 * v] - positions[3 * b]) ** 2 + (positions[3 * v + 1] - positions[3 * b + 1]) ** 2 + (positions[3 * v + 2] - positions[3 * b + 2]) ** 2;
      // The first choice replaces the centroid as the reference; later ones only bring vertices nearer.
      nearest[i] = chosen.length === 1 ? d : Math.min(nearest[i], d);
    }
  }
  return chosen;
}

/** Guides per cm² for a new groom on a surface of this area: about one per cm², within the count limits. */
function startingDensity(areaCm2: number): number {
  if (!(areaCm2 > 0)) return STARTING_DENSITY;
  const density = Math.min(Math.max(STARTING_DENSITY, STARTING_GUIDES.fewest / areaCm2), STARTING_GUIDES.most / areaCm2, MAX_DENSITY);
  return Number(density.toPrecision(3));
}

/**
 * A resolved spec for a new groom on the mesh. Guarantees: on every closed piece the placed
 * indices sum to the piece's Euler characteristic, each singularity sitting exactly on a vertex
 * (its point is the vertex's position), spread as far apart as farthest-point sampling finds.
 */
export function startingSpec(mesh: TriangleMesh, units: Unit, areaCm2: number): GroomSpec {
  const topology = buildTopology(mesh);
  const pieces = componentFacts(topology);
  const verticesOf: number[][] = pieces.map(() => []);
  const seen = new Uint8Array(topology.vertexCount);
  for (let f = 0; f < topology.faceCount; f++) {
    for (let k = 0; k < 3; k++) {
      const v = topology.triangles[3 * f + k];
      if (seen[v]) continue;
      seen[v] = 1;
      verticesOf[topology.componentOfFace[f]].push(v);
    }
  }
  const p = mesh.positions;
  const singularities = pieces.flatMap((piece, c) => {
    const chi = piece.eulerCharacteristic;
    if (piece.boundaryLoopCount > 0 || chi === 0) return [];
    return spreadVertices(p, verticesOf[c], Math.abs(chi)).map((v) => ({
      point: [p[3 * v], p[3 * v + 1], p[3 * v + 2]] as [number, number, number],
      index: Math.sign(chi),
    }));
  });
  return parseGroomSpec({
    specVersion: 2,
    units,
    field: { singularities },
    guides: { density: startingDensity(areaCm2) },
  });
}
