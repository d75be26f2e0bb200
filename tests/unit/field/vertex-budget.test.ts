// Vertex counts are bounded like face counts (three vertices per allowed triangle): a file of
// endless `v` lines, or a PLY header declaring millions of vertices, is refused at the budget
// instead of allocating what it asks for.
import { describe, expect, it } from 'vitest';
import { FieldError, readSurface } from '@/lib/field';

function refusal(run: () => unknown): FieldError {
  try {
    run();
  } catch (error) {
    expect(error).toBeInstanceOf(FieldError);
    return error as FieldError;
  }
  throw new Error('expected a FieldError');
}

const encode = (text: string) => new TextEncoder().encode(text);

describe('the vertex budget', () => {
  it('stops an OBJ of nothing but vertices at three per allowed triangle', () => {
    const obj = encode('v 0 0 0\n'.repeat(25_000));
    const error = refusal(() => readSurface(obj, 'points.obj', { maxFaces: 1_000 }));
    expect(error.code).toBe('too-many-vertices');
    expect(error.message).toBe('The surface has more than 3,000 vertices, three for each of the at most 1,000 triangles allowed. Decimate the surface (or remove unused vertices) before uploading it.');
  });

  it('takes an OBJ whose vertices fit the budget', () => {
    const obj = encode('v 0 0 0\nv 1 0 0\nv 0 1 0\nf 1 2 3\n');
    expect(readSurface(obj, 'one.obj', { maxFaces: 1 }).mesh.triangles.length).toBe(3);
  });

  it('refuses a PLY that holds more vertices than its face budget can use, before allocating them', () => {
    const header = encode('ply\nformat binary_little_endian 1.0\nelement vertex 4\nproperty float x\nproperty float y\nproperty float z\nend_header\n');
    const ply = new Uint8Array(header.length + 4 * 12);
    ply.set(header);
    expect(refusal(() => readSurface(ply, 'four.ply', { maxFaces: 1 })).code).toBe('too-many-vertices');
  });
});
