import { describe, expect, it } from 'vitest';
import { buildTopology } from '@/lib/field/mesh/topology';

describe('buildTopology on a face that uses a vertex twice', () => {
  it('refuses it instead of making a side its own twin', () => {
    // Before the check, the face (0, 0, 1) came out as a "closed" surface of one edge whose
    // halfedge 0 was its own twin.
    const mesh = { positions: new Float64Array(9), triangles: Uint32Array.of(0, 1, 2, 0, 0, 1, 2, 2, 2) };
    expect(() => buildTopology(mesh)).toThrow(expect.objectContaining({ code: 'degenerate-faces', message: expect.stringMatching(/2 faces use the same vertex twice.*faces 1, 2/) }));
  });
});
