/**
 * Polygons with more corners than this are split as a fan: ear clipping costs up to cubic time
 * in the corner count, and a surface with such faces is rare enough that a hostile file must not
 * be able to stall the reader with them.
 */
const EAR_CLIPPING_LIMIT = 64;

/**
 * Splits one polygon (corner indices into `positions`, in the file's winding) into `n − 2`
 * triangles and hands each to `emit` as three of the polygon's own corner numbers (0 … n − 1,
 * so the caller can state every triangle in the polygon's terms), with the polygon's winding
 * kept, so their normals agree with the polygon's.
 *
 * Guarantees: always exactly `n − 2` triangles using only the polygon's corners; for a simple
 * planar (or nearly planar) polygon, convex or not, the triangles tile it without overlap (ear
 * clipping in the plane of its Newell normal). For self-intersecting, degenerate or very large
 * polygons the result is still `n − 2` triangles, without that guarantee.
 */
export function triangulatePolygon(
  positions: Float64Array,
  corners: ArrayLike<number>,
  start: number,
  n: number,
  emit: (a: number, b: number, c: number) => void,
): void {
  const corner = (i: number) => corners[start + i];
  if (n === 3) {
    emit(0, 1, 2);
    return;
  }

  // Newell's normal is the polygon's area vector; it is robust for non-planar polygons.
  let nx = 0;
  let ny = 0;
  let nz = 0;
  for (let i = 0; i < n; i++) {
    const p = 3 * corner(i);
    const q = 3 * corner((i + 1) % n);
    nx += (positions[p + 1] - positions[q + 1]) * (positions[p + 2] + positions[q + 2]);
    ny += (positions[p + 2] - positions[q + 2]) * (positions[p] + positions[q]);
    nz += (positions[p] - positions[q]) * (positions[p + 1] + positions[q + 1]);
  }
  const ax = Math.abs(nx);
  const ay = Math.abs(ny);
  const az = Math.abs(nz);
  if (n > EAR_CLIPPING_LIMIT || !(ax + ay + az > 0)) {
    for (let i = 1; i + 1 < n; i++) emit(0, i, i + 1);
    return;
  }

  // Project on the coordinate plane most facing the normal, with the axes ordered so that the
  // polygon's winding is counter-clockwise (positive area) in the projection.
  const drop = az >= ax && az >= ay ? 2 : ay >= ax ? 1 : 0;
  const uAxis = (drop + 1) % 3;
  const vAxis = (drop + 2) % 3;
  const flip = (drop === 0 ? nx : drop === 1 ? ny : nz) < 0 ? -1 : 1;
  const u = new Float64Array(n);
  const v = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    u[i] = positions[3 * corner(i) + uAxis];
    v[i] = flip * positions[3 * corner(i) + vAxis];
  }

  const next = new Int32Array(n);
  const prev = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    next[i] = (i + 1) % n;
    prev[i] = (i + n - 1) % n;
  }
  const cross = (a: number, b: number, c: number) => (u[b] - u[a]) * (v[c] - v[a]) - (v[b] - v[a]) * (u[c] - u[a]);
  const isEar = (b: number): boolean => {
    const a = prev[b];
    const c = next[b];
    if (!(cross(a, b, c) > 0)) return false;
    for (let p = next[c]; p !== a; p = next[p]) {
      if (cross(a, b, p) >= 0 && cross(b, c, p) >= 0 && cross(c, a, p) >= 0) return false;
    }
    return true;
  };

  let remaining = n;
  let current = 0;
  let failures = 0;
  while (remaining > 3) {
    // After a full round without an ear the polygon is degenerate or self-intersecting; clipping
    // anyway keeps the triangle count right and guarantees the loop ends.
    if (isEar(current) || failures >= remaining) {
      const a = prev[current];
      const c = next[current];
      emit(a, current, c);
      next[a] = c;
      prev[c] = a;
      remaining--;
      failures = 0;
      current = c;
    } else {
      failures++;
      current = next[current];
    }
  }
  emit(prev[current], current, next[current]);
}
