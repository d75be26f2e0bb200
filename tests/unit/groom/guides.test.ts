import { BufferAttribute, BufferGeometry, DoubleSide, Mesh, MeshBasicMaterial, Raycaster, Vector3 } from 'three';
import { describe, expect, it } from 'vitest';
import type { TriangleMesh } from '@/lib/field';
import { gridPlane, icosphere, latitudeRingVertices, torus, uvSphere } from '@/tests/fixtures/shapes';
import { prepareGroomSurface } from '@/lib/groom/place/surface';
import { solveGroomField } from '@/lib/groom/place/request';
import { parseGroomSpec } from '@/lib/groom/spec/spec';
import { createTracer, STOP } from '@/lib/groom/grow/trace';
import { groomOn } from './support';

/**
 * Inside test independent of lib/groom's skin index: the parity of the crossings of a ray with
 * three.js's own (brute-force) mesh ray caster — a point inside a closed surface sees an odd count.
 */
function insideCounter(mesh: TriangleMesh) {
  const geometry = new BufferGeometry();
  geometry.setAttribute('position', new BufferAttribute(Float32Array.from(mesh.positions), 3));
  geometry.setIndex(new BufferAttribute(Uint32Array.from(mesh.triangles), 1));
  const object = new Mesh(geometry, new MeshBasicMaterial({ side: DoubleSide }));
  const raycaster = new Raycaster();
  const direction = new Vector3(0.31, 0.87, 0.38).normalize();
  return (x: number, y: number, z: number) => {
    raycaster.set(new Vector3(x, y, z), direction);
    return raycaster.intersectObject(object, false).length % 2 === 1;
  };
}

function firstSegmentAngles(result: ReturnType<typeof groomOn>): number[] {
  const { guides, surface, solved } = result;
  const n = guides.pointsPerGuide;
  const normal = surface.field.frames.normal;
  const angles: number[] = [];
  for (let g = 0; g < guides.count; g++) {
    const f = guides.rootFace[g];
    const q = 3 * g * n;
    const d = [0, 1, 2].map((k) => guides.points[q + 3 + k] - guides.points[q + k]);
    const nf = [0, 1, 2].map((k) => normal[3 * f + k]);
    const along = d[0] * nf[0] + d[1] * nf[1] + d[2] * nf[2];
    const t = d.map((x, k) => x - along * nf[k]);
    const field = [0, 1, 2].map((k) => solved.field.faceDirection[3 * f + k]);
    const cos = (t[0] * field[0] + t[1] * field[1] + t[2] * field[2]) / Math.hypot(t[0], t[1], t[2]);
    angles.push((Math.acos(Math.min(1, cos)) * 180) / Math.PI);
  }
  return angles;
}

describe('tracing', () => {
  it('crosses edges exactly: on a flat sheet with a constant field the streamline is the straight line', () => {
    const mesh = gridPlane(20, 20, 2, 2);
    const spec = parseGroomSpec({ specVersion: 2, units: 'cm', upAxis: 'z', field: { referenceDirection: [1, 0.3, 0] } });
    const surface = prepareGroomSurface(mesh);
    const solved = solveGroomField(spec, surface);
    const tracer = createTracer(surface.field, solved.field, new Uint8Array(mesh.positions.length / 3), solved.connection.cutEdge);
    const direction = [1, 0.3, 0].map((x) => x / Math.hypot(1, 0.3));
    const start = [-0.83, -0.52, 0];
    const query = new Float64Array(8);
    expect(surface.skin.closest(start[0], start[1], start[2], 1, query)).toBe(true);
    const targets = Float64Array.from({ length: 12 }, (_, i) => 0.1 * (i + 1));
    const out = new Float64Array(3 * 12);
    const faces = new Uint32Array(12);
    const reached = tracer.trace(query[7], start[0], start[1], start[2], targets, 12, out, faces, 0);
    expect(reached).toBe(12);
    for (let i = 0; i < 12; i++) {
      for (let k = 0; k < 3; k++) expect(out[3 * i + k]).toBeCloseTo(start[k] + targets[i] * direction[k], 12);
    }
    // A long one runs into the free boundary and says so.
    const far = tracer.trace(query[7], start[0], start[1], start[2], Float64Array.of(10), 1, out, faces, 0);
    expect(far).toBe(0);
    expect(tracer.end.reason).toBe(STOP.boundary);
    expect(tracer.end.x).toBeCloseTo(1, 12);
  });

  it('stops at a singularity: streamlines into an inflow whorl end next to it', () => {
    const mesh = icosphere(4, 1);
    const spec = parseGroomSpec({
      specVersion: 2,
      units: 'cm',
      field: { singularities: [{ point: [0, 1, 0], index: 1, twist: 180 }, { point: [0, -1, 0], index: 1 }] },
    });
    const surface = prepareGroomSurface(mesh);
    const solved = solveGroomField(spec, surface);
    const singular = new Uint8Array(mesh.positions.length / 3);
    let sink = -1;
    solved.connection.requestedIndex.forEach((x, v) => {
      if (x !== 0) singular[v] = 1;
      if (x !== 0 && mesh.positions[3 * v + 1] > 0) sink = v;
    });
    const tracer = createTracer(surface.field, solved.field, singular, solved.connection.cutEdge);
    const query = new Float64Array(8);
    const edge = 0.08;
    let stopped = 0;
    for (const [x, y, z] of [[0.5, 0.8, 0.2], [-0.4, 0.85, -0.3], [0.1, 0.6, 0.75], [-0.7, 0.7, 0.1]]) {
      const l = Math.hypot(x, y, z);
      surface.skin.closest(x / l, y / l, z / l, 1, query);
      const reached = tracer.trace(query[7], query[0], query[1], query[2], Float64Array.of(5), 1, new Float64Array(3), new Uint32Array(1), 0);
      expect(reached).toBe(0);
      expect([STOP.singularity, STOP.converged]).toContain(tracer.end.reason);
      const d = Math.hypot(tracer.end.x - mesh.positions[3 * sink], tracer.end.y - mesh.positions[3 * sink + 1], tracer.end.z - mesh.positions[3 * sink + 2]);
      expect(d).toBeLessThan(2.5 * edge);
      stopped++;
    }
    expect(stopped).toBe(4);
  });
});

describe('guides', () => {
  const sphereSpec = {
    specVersion: 2 as const,
    units: 'cm' as const,
    field: { singularities: [{ point: [0, 1, 0] as [number, number, number], index: 1, twist: 30 }, { point: [0, -1, 0] as [number, number, number], index: 1, twist: 150, handedness: 'clockwise' as const }] },
    guides: { density: 60, length: 0.4, lift: 25, droop: 0.5, curl: { amplitude: 0.02, wavelength: 0.15 }, jitter: 0.5 },
  };

  it('leave every root along the field: the first segment’s tangent part is within 1° of the field there', () => {
    const result = groomOn(icosphere(4, 1), sphereSpec);
    expect(result.guides.count).toBe(Math.round(60 * result.areaSquareCm));
    const angles = firstSegmentAngles(result);
    expect(Math.max(...angles)).toBeLessThan(1);
    for (const x of result.guides.points) expect(Number.isFinite(x)).toBe(true);
  });

  it('never put a point inside the surface, even where droop pulls them into it', () => {
    // A ring whose guides hang straight down: many fall against the tube and the inner hole.
    const mesh = torus(1, 0.35, 48, 24);
    const result = groomOn(mesh, {
      specVersion: 2,
      units: 'cm',
      upAxis: 'z',
      field: {},
      guides: { density: 40, length: 0.8, lift: 0, droop: 1, jitter: 1, curl: { amplitude: 0.05, wavelength: 0.2 } },
    });
    expect(result.pushedOut).toBeGreaterThan(0);
    const inside = insideCounter(mesh);
    const { guides } = result;
    let checked = 0;
    for (let g = 0; g < guides.count; g += 3) {
      for (let i = 1; i < guides.pointsPerGuide; i++) {
        const q = 3 * (g * guides.pointsPerGuide + i);
        expect(inside(guides.points[q], guides.points[q + 1], guides.points[q + 2])).toBe(false);
        checked++;
      }
    }
    expect(checked).toBeGreaterThan(1000);
    expect(Math.max(...firstSegmentAngles(result))).toBeLessThan(1);
  });

  it('are identical for the same spec on the same surface', () => {
    const a = groomOn(icosphere(3, 1), sphereSpec).guides;
    const b = groomOn(icosphere(3, 1), sphereSpec).guides;
    expect(b.count).toBe(a.count);
    expect(Buffer.from(b.points.buffer).equals(Buffer.from(a.points.buffer))).toBe(true);
    const c = groomOn(icosphere(3, 1), { ...sphereSpec, guides: { ...sphereSpec.guides, seed: 2 } }).guides;
    expect(Buffer.from(c.points.buffer).equals(Buffer.from(a.points.buffer))).toBe(false);
  });

  it('vary with pins: a length pin makes guides longer near it', () => {
    const result = groomOn(icosphere(4, 1), { ...sphereSpec, guides: { ...sphereSpec.guides, jitter: 0, curl: { amplitude: 0 } }, pins: [{ attribute: 'length', point: [1, 0, 0], value: 2 }, { attribute: 'length', point: [-1, 0, 0], value: 0.5 }] });
    const { guides } = result;
    const n = guides.pointsPerGuide;
    let near = 0, nearCount = 0, far = 0, farCount = 0;
    for (let g = 0; g < guides.count; g++) {
      const x = guides.points[3 * g * n];
      if (x > 0.9) { near += guides.length[g]; nearCount++; }
      if (x < -0.9) { far += guides.length[g]; farCount++; }
    }
    // Pins blend by inverse squared distance along the surface, so within a tenth of the sphere
    // of each pin its own value dominates: the contrast must be clearly there.
    expect(near / nearCount / (far / farCount)).toBeGreaterThan(1.3);
  });

  it('stop their skin path at partings and crests', () => {
    // A crest along a third of a circle of latitude (an edge loop of the UV sphere), which with
    // the whorl at the south pole balances the sphere's index budget of 2.
    const mesh = uvSphere(24, 48, 1);
    const ring = Array.from(latitudeRingVertices(24, 48, 5).vertices.slice(0, 17));
    const result = groomOn(mesh, {
      specVersion: 2,
      units: 'cm',
      upAxis: 'z',
      field: {
        singularities: [{ point: [0, 0, -1], index: 1 }],
        crests: [{ vertices: ring }],
      },
      guides: { density: 30, length: 1.5, lift: 0, droop: 0, jitter: 0 },
    });
    expect(result.guides.stop.some((s) => s === STOP.curve)).toBe(true);
  });
});
