import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { checkSurfaceFile, readSurface } from '@/lib/field';
import { drawsSameSurface, guideSegments, nearestCorner, neighbourOf, problemMarks } from '@/lib/studio/client/surface-geometry';
import { surfaceToObj } from '@/lib/groom/demo/obj';
import { uvSphere } from '@/lib/groom/demo/primitives';
import { FieldEngine } from '@/lib/studio/client/field-engine';
import type { SurfacePreview } from '@/lib/studio/client/protocol';
import { nameFromFile, timeAgo } from '@/lib/studio/client/format';
import { formatBytes, extensionOf } from '@/lib/studio/client/api';

const fixture = (name: string) => new Uint8Array(readFileSync(`tests/fixtures/surfaces/${name}`));

describe('marks for a rejected surface', () => {
  it('marks the misoriented edges the check names, on the mesh the browser reads from the same file', () => {
    const bytes = fixture('misoriented-strip.obj');
    const { report } = checkSurfaceFile(bytes, 'misoriented-strip.obj');
    expect(report.ok).toBe(false);
    const { mesh } = readSurface(bytes, 'misoriented-strip.obj');
    const marks = problemMarks(report.problems, mesh.positions, mesh.triangles);
    expect(marks.marked.length).toBeGreaterThan(0);
    // Two misoriented edges: vertices 2–3 and 3–4.
    expect(marks.edges.length).toBe(12);
    expect(marks.vertices.sort()).toEqual([2, 3, 4]);
  });

  it('marks faces and vertices, skips examples outside the mesh and file-numbered faces', () => {
    const positions = new Float64Array([0, 0, 0, 1, 0, 0, 0, 1, 0, 1, 1, 0]);
    const triangles = new Uint32Array([0, 1, 2, 1, 3, 2]);
    const marks = problemMarks(
      [
        { code: 'degenerate-faces', severity: 'error', message: '', count: 2, examples: [1, 7], where: 'face' },
        { code: 'isolated-vertices', severity: 'warning', message: '', count: 1, examples: [3], where: 'vertex' },
        { code: 'collapsed-faces', severity: 'warning', message: '', count: 1, examples: [0], where: 'face' },
        { code: 'wrong-format', severity: 'error', message: '', count: 1, examples: [], where: 'file' },
      ],
      positions,
      triangles,
    );
    expect(marks).toEqual({ faces: [1], edges: [], vertices: [3], marked: ['degenerate-faces', 'isolated-vertices'] });
  });
});

describe('small helpers', () => {
  it('finds the corner of a face nearest a point, and a neighbour', () => {
    const positions = [0, 0, 0, 1, 0, 0, 0, 1, 0];
    const triangles = new Uint32Array([0, 1, 2]);
    expect(nearestCorner(positions, triangles, 0, [0.9, 0.05, 0])).toBe(1);
    expect(nearestCorner(positions, triangles, 0, [0.1, 0.8, 0])).toBe(2);
    expect(neighbourOf(triangles, 2)).toBe(0);
  });

  it('turns guides into shaded segments', () => {
    const { lines, shade } = guideSegments({ count: 2, pointsPerGuide: 3, points: new Float32Array(18).map((_, i) => i) });
    expect(lines.length).toBe(2 * 2 * 6);
    expect(Array.from(lines.subarray(0, 6))).toEqual([0, 1, 2, 3, 4, 5]);
    expect(Array.from(lines.subarray(12, 18))).toEqual([9, 10, 11, 12, 13, 14]);
    expect(Array.from(shade.subarray(0, 4))).toEqual([0, 0.5, 0.5, 1]);
  });

  it('says sizes, names and times in words', () => {
    expect(formatBytes(200_000_000)).toBe('200 MB');
    expect(formatBytes(1_234_567)).toBe('1.2 MB');
    expect(formatBytes(512)).toBe('512 bytes');
    expect(extensionOf('Fox.Head.OBJ')).toBe('obj');
    expect(extensionOf('noext')).toBe('');
    expect(nameFromFile('bramble_head-v3.obj')).toBe('bramble head v3');
    const now = Date.parse('2026-03-01T12:00:00Z');
    expect(timeAgo('2026-03-01T11:59:40Z', now)).toBe('just now');
    expect(timeAgo('2026-03-01T11:55:00Z', now)).toBe('5 minutes ago');
    expect(timeAgo('2026-02-28T11:00:00Z', now)).toBe('yesterday');
  });

  it('dates an older instant by the day it was in the given time zone, and by default in the viewer’s', () => {
    const now = Date.parse('2026-03-01T12:00:00Z');
    // 11:00 UTC on 1 January is already midnight of 2 January in Auckland (UTC+13 in summer).
    expect(timeAgo('2026-01-01T11:00:00Z', now, 'UTC')).toBe('1 Jan 2026');
    expect(timeAgo('2026-01-01T11:00:00Z', now, 'Pacific/Auckland')).toBe('2 Jan 2026');
    expect(timeAgo('2026-01-01T10:59:00Z', now, 'Pacific/Auckland')).toBe('1 Jan 2026');
    const viewers = process.env.TZ;
    try {
      for (const [zone, day] of [['Pacific/Auckland', '2 Jan 2026'], ['UTC', '1 Jan 2026']]) {
        process.env.TZ = zone; // Node re-reads TZ when it is assigned
        expect(timeAgo('2026-01-01T11:00:00Z', now), zone).toBe(day);
      }
    } finally {
      if (viewers === undefined) delete process.env.TZ;
      else process.env.TZ = viewers;
    }
  });
});

describe('the surface as read and the prepared surface drawn once (drawsSameSurface)', () => {
  it('holds for a surface the field engine opened: the preview it sends first draws exactly the prepared surface', async () => {
    const sphere = uvSphere(12, 16, 10);
    let preview: SurfacePreview | undefined;
    const engine = new FieldEngine((report) => (preview ??= report.preview));
    const opened = await engine.open({ kind: 'bytes', bytes: new TextEncoder().encode(surfaceToObj(sphere, 'sphere')).buffer as ArrayBuffer, fileName: 'sphere.obj' }, 'free');
    expect(preview).toBeDefined();
    expect(drawsSameSurface(preview!, opened)).toBe(true);
  });

  it('fails on another triangle order, on a position that single precision tells apart, and on another size; passes on rounding alone', () => {
    // 1 + 2⁻³⁰ rounds to 1 in single precision (24-bit significand, IEEE 754); 1 + 2⁻²⁰ does not.
    const prepared = { positions: new Float64Array([0, 0, 0, 1 + 2 ** -30, 0, 0, 0, 1, 0]), triangles: new Uint32Array([0, 1, 2]) };
    const drawn = { positions: new Float32Array([0, 0, 0, 1, 0, 0, 0, 1, 0]), triangles: new Uint32Array([0, 1, 2]) };
    expect(drawsSameSurface(drawn, prepared)).toBe(true);
    expect(drawsSameSurface({ ...drawn, triangles: new Uint32Array([1, 2, 0]) }, prepared)).toBe(false);
    expect(drawsSameSurface(drawn, { ...prepared, positions: new Float64Array([0, 0, 0, 1 + 2 ** -20, 0, 0, 0, 1, 0]) })).toBe(false);
    expect(drawsSameSurface(drawn, { ...prepared, triangles: new Uint32Array([0, 1, 2, 0, 2, 1]) })).toBe(false);
  });
});
