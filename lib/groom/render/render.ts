import type { TriangleMesh } from '../../field';
import type { Guides } from '../grow/guides';

/**
 * A software renderer for groom thumbnails: the surface z-buffered and shaded, the guides drawn
 * over it as anti-aliased lines that the surface hides where it is in front of them. Plain
 * arithmetic on typed arrays, so it runs in a Web Worker as well as on the server.
 */

export type ThumbnailView = 'front' | 'side' | 'top';
export const THUMBNAIL_VIEWS: readonly ThumbnailView[] = ['front', 'side', 'top'];
/** What colours the guides: their length (a ramp from shortest to longest), their root direction (x, y, z as red, green, blue), or one colour. */
export type GuideColouring = 'length' | 'direction' | 'uniform';

export interface RgbaImage {
  readonly width: number;
  readonly height: number;
  /** 4 bytes per pixel, rows from the top, not premultiplied. */
  readonly data: Uint8ClampedArray;
}

export interface RenderOptions {
  /** Width and height in pixels. */
  readonly size: number;
  readonly view: ThumbnailView;
  readonly upAxis: 'y' | 'z';
  readonly colourBy?: GuideColouring;
  /** Opaque background colour, RGB. */
  readonly background?: readonly [number, number, number];
}

const SKIN = [214, 196, 178];
const UNIFORM_GUIDE = [92, 58, 36];
/** Fraction of the image the model fills, leaving a margin around it. */
const FILL = 0.9;

/** Camera axes for a view: right, up, and the direction it looks in (into the scene). */
function cameraAxes(view: ThumbnailView, upAxis: 'y' | 'z'): { right: number[]; up: number[]; forward: number[] } {
  // A Y-up character faces +Z; a Z-up one faces −Y. "front" looks at its face, "side" at its left
  // flank (from +X), "top" down from above with the face toward the bottom of the image.
  if (upAxis === 'y') {
    if (view === 'front') return { right: [1, 0, 0], up: [0, 1, 0], forward: [0, 0, -1] };
    if (view === 'side') return { right: [0, 0, -1], up: [0, 1, 0], forward: [-1, 0, 0] };
    return { right: [1, 0, 0], up: [0, 0, -1], forward: [0, -1, 0] };
  }
  if (view === 'front') return { right: [1, 0, 0], up: [0, 0, 1], forward: [0, 1, 0] };
  if (view === 'side') return { right: [0, 1, 0], up: [0, 0, 1], forward: [-1, 0, 0] };
  return { right: [1, 0, 0], up: [0, 1, 0], forward: [0, 0, -1] };
}

/** Maps t in [0, 1] onto a dark-violet → orange → pale-yellow ramp that stays readable on skin tones. */
function ramp(t: number, out: number[]): void {
  const stops = [
    [48, 18, 92],
    [186, 54, 85],
    [249, 142, 9],
    [252, 230, 120],
  ];
  const x = Math.min(1, Math.max(0, t)) * (stops.length - 1);
  const i = Math.min(stops.length - 2, Math.floor(x));
  const f = x - i;
  for (let k = 0; k < 3; k++) out[k] = stops[i][k] + f * (stops[i + 1][k] - stops[i][k]);
}

/**
 * Renders the surface and guides in orthographic projection along one of three axes.
 *
 * Guarantees: an opaque `size` × `size` image; the model (surface and guides) fits inside it
 * with a margin; every guide pixel is blended by its coverage (Xiaolin Wu's anti-aliasing) and
 * hidden where the surface lies in front of it; the same input gives the same pixels.
 */
export function renderThumbnail(mesh: TriangleMesh, guides: Guides | null, options: RenderOptions): RgbaImage {
  const size = Math.max(1, Math.round(options.size));
  const { right, up, forward } = cameraAxes(options.view, options.upAxis);
  const background = options.background ?? [246, 244, 240];
  const data = new Uint8ClampedArray(4 * size * size);
  for (let i = 0; i < size * size; i++) {
    data[4 * i] = background[0]; data[4 * i + 1] = background[1]; data[4 * i + 2] = background[2]; data[4 * i + 3] = 255;
  }
  const depth = new Float32Array(size * size).fill(Infinity);

  // Screen placement: fit the projected bounds of everything drawn.
  const p = mesh.positions;
  let minX = Infinity, maxX = -Infinity, minY = Infinity, maxY = -Infinity;
  const fit = (x: number, y: number, z: number) => {
    const sx = x * right[0] + y * right[1] + z * right[2];
    const sy = x * up[0] + y * up[1] + z * up[2];
    if (sx < minX) minX = sx;
    if (sx > maxX) maxX = sx;
    if (sy < minY) minY = sy;
    if (sy > maxY) maxY = sy;
  };
  for (let v = 0; v < p.length; v += 3) fit(p[v], p[v + 1], p[v + 2]);
  if (guides) for (let i = 0; i < guides.points.length; i += 3) fit(guides.points[i], guides.points[i + 1], guides.points[i + 2]);
  if (!(maxX >= minX)) return { width: size, height: size, data };
  const scale = (FILL * size) / Math.max(maxX - minX, maxY - minY, 1e-12);
  const offsetX = size / 2 - (scale * (minX + maxX)) / 2;
  const offsetY = size / 2 + (scale * (minY + maxY)) / 2;
  const toScreen = (x: number, y: number, z: number, out: Float64Array, at: number) => {
    out[at] = offsetX + scale * (x * right[0] + y * right[1] + z * right[2]);
    out[at + 1] = offsetY - scale * (x * up[0] + y * up[1] + z * up[2]);
    out[at + 2] = x * forward[0] + y * forward[1] + z * forward[2];
  };

  // Light from over the viewer's left shoulder: toward the camera, a little up and to the left.
  const light = [0, 1, 2].map((k) => -forward[k] + 0.45 * up[k] - 0.3 * right[k]);
  const lightLength = Math.hypot(light[0], light[1], light[2]);
  drawSurface(mesh, size, data, depth, light.map((x) => x / lightLength), toScreen);
  if (guides && guides.count > 0) drawGuides(guides, size, data, depth, scale, options.colourBy ?? 'length', toScreen);
  return { width: size, height: size, data };
}

type Project = (x: number, y: number, z: number, out: Float64Array, at: number) => void;

function drawSurface(mesh: TriangleMesh, size: number, data: Uint8ClampedArray, depth: Float32Array, light: number[], toScreen: Project): void {
  const p = mesh.positions;
  const tri = mesh.triangles;
  const nV = p.length / 3;
  const screen = new Float64Array(3 * nV);
  for (let v = 0; v < nV; v++) toScreen(p[3 * v], p[3 * v + 1], p[3 * v + 2], screen, 3 * v);
  for (let f = 0; f < tri.length / 3; f++) {
    const a = tri[3 * f], b = tri[3 * f + 1], c = tri[3 * f + 2];
    const ax = screen[3 * a], ay = screen[3 * a + 1], az = screen[3 * a + 2];
    const bx = screen[3 * b], by = screen[3 * b + 1], bz = screen[3 * b + 2];
    const cx = screen[3 * c], cy = screen[3 * c + 1], cz = screen[3 * c + 2];
    const area = (bx - ax) * (cy - ay) - (by - ay) * (cx - ax);
    if (area === 0) continue;
    // Shade by the world normal against the light; faces seen from behind are darker.
    const ux = p[3 * b] - p[3 * a], uy = p[3 * b + 1] - p[3 * a + 1], uz = p[3 * b + 2] - p[3 * a + 2];
    const vx = p[3 * c] - p[3 * a], vy = p[3 * c + 1] - p[3 * a + 1], vz = p[3 * c + 2] - p[3 * a + 2];
    const nx = uy * vz - uz * vy, ny = uz * vx - ux * vz, nz = ux * vy - uy * vx;
    const nl = Math.hypot(nx, ny, nz) || 1;
    const facing = (nx * light[0] + ny * light[1] + nz * light[2]) / nl;
    const shade = facing >= 0 ? 0.35 + 0.65 * facing : 0.2 + 0.2 * -facing;
    const r = SKIN[0] * shade, g = SKIN[1] * shade, bl = SKIN[2] * shade;
    const x0 = Math.max(0, Math.floor(Math.min(ax, bx, cx))), x1 = Math.min(size - 1, Math.ceil(Math.max(ax, bx, cx)));
    const y0 = Math.max(0, Math.floor(Math.min(ay, by, cy))), y1 = Math.min(size - 1, Math.ceil(Math.max(ay, by, cy)));
    const inv = 1 / area;
    for (let y = y0; y <= y1; y++) {
      const py = y + 0.5;
      for (let x = x0; x <= x1; x++) {
        const px = x + 0.5;
        // Barycentric weights by edge functions; a pixel centre is covered when all share the area's sign.
        const w0 = ((bx - px) * (cy - py) - (by - py) * (cx - px)) * inv;
        const w1 = ((cx - px) * (ay - py) - (cy - py) * (ax - px)) * inv;
        const w2 = 1 - w0 - w1;
        if (w0 < 0 || w1 < 0 || w2 < 0) continue;
        const z = w0 * az + w1 * bz + w2 * cz;
        const i = y * size + x;
        if (z >= depth[i]) continue;
        depth[i] = z;
        data[4 * i] = r; data[4 * i + 1] = g; data[4 * i + 2] = bl;
      }
    }
  }
}

function drawGuides(guides: Guides, size: number, data: Uint8ClampedArray, depth: Float32Array, scale: number, colourBy: GuideColouring, toScreen: Project): void {
  const n = guides.pointsPerGuide;
  const pts = guides.points;
  let shortest = Infinity, longest = -Infinity;
  for (const l of guides.length) {
    shortest = Math.min(shortest, l);
    longest = Math.max(longest, l);
  }
  // Guides lying on the skin would fight with it in the depth test; they may sink this far into it.
  let extent = 0;
  for (let i = 0; i < pts.length; i++) extent = Math.max(extent, Math.abs(pts[i]));
  const bias = 2 / scale + 1e-6 * extent;
  const colour = [0, 0, 0];
  const screen = new Float64Array(3 * n);

  const plot = (x: number, y: number, z: number, coverage: number) => {
    if (x < 0 || y < 0 || x >= size || y >= size || coverage <= 0) return;
    const i = y * size + x;
    if (z > depth[i] + bias) return;
    const a = Math.min(1, coverage);
    data[4 * i] += a * (colour[0] - data[4 * i]);
    data[4 * i + 1] += a * (colour[1] - data[4 * i + 1]);
    data[4 * i + 2] += a * (colour[2] - data[4 * i + 2]);
  };

  for (let g = 0; g < guides.count; g++) {
    const o = 3 * g * n;
    if (colourBy === 'length') ramp(longest > shortest ? (guides.length[g] - shortest) / (longest - shortest) : 0.5, colour);
    else if (colourBy === 'direction') {
      const dx = pts[o + 3] - pts[o], dy = pts[o + 4] - pts[o + 1], dz = pts[o + 5] - pts[o + 2];
      const l = Math.hypot(dx, dy, dz) || 1;
      colour[0] = 255 * (0.5 + (0.5 * dx) / l); colour[1] = 255 * (0.5 + (0.5 * dy) / l); colour[2] = 255 * (0.5 + (0.5 * dz) / l);
    } else {
      colour[0] = UNIFORM_GUIDE[0]; colour[1] = UNIFORM_GUIDE[1]; colour[2] = UNIFORM_GUIDE[2];
    }
    for (let i = 0; i < n; i++) toScreen(pts[o + 3 * i], pts[o + 3 * i + 1], pts[o + 3 * i + 2], screen, 3 * i);
    for (let i = 0; i + 1 < n; i++) wuLine(screen[3 * i], screen[3 * i + 1], screen[3 * i + 2], screen[3 * i + 3], screen[3 * i + 4], screen[3 * i + 5], plot);
  }
}

/**
 * Xiaolin Wu's line ("An Efficient Antialiasing Technique", SIGGRAPH 1991): along the major axis,
 * each step lights the two pixels the line passes between, in proportion to how close it runs to
 * each; the depth is interpolated along the line.
 */
function wuLine(x0: number, y0: number, z0: number, x1: number, y1: number, z1: number, plot: (x: number, y: number, z: number, c: number) => void): void {
  // Pixel centres sit at half-integers; shift so that integer coordinates address centres.
  x0 -= 0.5; y0 -= 0.5; x1 -= 0.5; y1 -= 0.5;
  const steep = Math.abs(y1 - y0) > Math.abs(x1 - x0);
  if (steep) {
    [x0, y0] = [y0, x0];
    [x1, y1] = [y1, x1];
  }
  if (x0 > x1) {
    [x0, x1] = [x1, x0];
    [y0, y1] = [y1, y0];
    [z0, z1] = [z1, z0];
  }
  const dx = x1 - x0;
  const gradient = dx === 0 ? 0 : (y1 - y0) / dx;
  const depthStep = dx === 0 ? 0 : (z1 - z0) / dx;
  const start = Math.round(x0), end = Math.round(x1);
  for (let x = start; x <= end; x++) {
    // The ends are weighted by how much of their pixel the segment covers along the major axis.
    const along = x === start && x === end ? dx : x === start ? 0.5 - (x0 - start) : x === end ? 0.5 + (x1 - end) : 1;
    if (along <= 0) continue;
    const y = y0 + gradient * (x - x0);
    const z = z0 + depthStep * (x - x0);
    const base = Math.floor(y);
    const frac = y - base;
    if (steep) {
      plot(base, x, z, (1 - frac) * along);
      plot(base + 1, x, z, frac * along);
    } else {
      plot(x, base, z, (1 - frac) * along);
      plot(x, base + 1, z, frac * along);
    }
  }
}
