import sharp from 'sharp';
import type { TriangleMesh } from '../../field';
import { GroomError } from '../errors';

/** How an image's pixels become factors: black is `low`, full white `high` (our default: 0× to 1×, the spec's value the most). */
export interface ImageMapOptions {
  readonly low?: number;
  readonly high?: number;
}

/** An image's first channel as numbers from 0 to `top`, row after row from the top. */
interface Channel {
  readonly width: number;
  readonly height: number;
  readonly top: number;
  readonly at: (x: number, y: number) => number;
}

async function firstChannel(bytes: Uint8Array): Promise<Channel> {
  let depth: string | undefined;
  try {
    depth = (await sharp(bytes).metadata()).depth;
  } catch (error) {
    throw new GroomError('bad-image', `The map image cannot be read (PNG or TIFF expected): ${(error as Error).message}`);
  }
  // 16-bit images are read in a 16-bit pipeline: sharp's default turns everything into 8-bit sRGB.
  // Colour conversion is avoided either way, so a pixel's value is the file's own.
  if (depth === 'ushort') {
    const { data, info } = await sharp(bytes).pipelineColourspace('rgb16').toColourspace('rgb16').extractChannel(0).raw({ depth: 'ushort' }).toBuffer({ resolveWithObject: true });
    const values = new Uint16Array(data.buffer, data.byteOffset, info.width * info.height);
    return { width: info.width, height: info.height, top: 65535, at: (x, y) => values[y * info.width + x] };
  }
  if (depth !== 'uchar') throw new GroomError('bad-image', `The map image has ${depth ?? 'an unknown'} samples; 8-bit or 16-bit PNG or TIFF expected.`);
  const { data, info } = await sharp(bytes).extractChannel(0).raw().toBuffer({ resolveWithObject: true });
  return { width: info.width, height: info.height, top: 255, at: (x, y) => data[y * info.width + x] };
}

/**
 * A map's factor per vertex of `mesh`, read from an image through the surface's UVs: the image's
 * first channel (the grey of a greyscale image, the red of a colour one; alpha ignored), 8 or 16
 * bits, PNG or TIFF, sampled bilinearly between pixel centres at each corner's UV — (0, 0) the
 * bottom-left corner of the image, as the mesh's UVs are stored (lib/field's readers turn glTF's
 * v); UVs outside [0, 1] repeat, as glTF's default sampler does — and scaled from [0, top] to
 * [low, high].
 *
 * A vertex split in UV space (a seam) has several corners with different UVs: it takes the mean
 * of its corners' samples, each corner of each triangle around it counting once (our choice: on a
 * map painted across the seam the sides agree, and where they do not, neither side wins).
 *
 * Guarantees: one finite value per vertex in [low, high]; at a UV on a pixel centre, exactly that
 * pixel's value scaled; refuses (GroomError `uv-missing`) a surface without UVs and (`bad-image`)
 * bytes sharp cannot read as an 8- or 16-bit image, in words.
 */
export async function readImageMap(bytes: Uint8Array, mesh: TriangleMesh, options: ImageMapOptions = {}): Promise<Float64Array> {
  const uv = mesh.cornerUvs;
  if (!uv) {
    throw new GroomError('uv-missing', 'The surface has no UVs (a texture coordinate at every corner), so an image map cannot be read onto it; export the surface with its UVs, or paint the map in the editor.');
  }
  const low = options.low ?? 0, high = options.high ?? 1;
  if (!(low >= 0 && high <= 10 && low <= high)) throw new RangeError(`An image map's factors run from low to high within 0–10; got ${low} to ${high}.`);
  const image = await firstChannel(bytes);
  const nV = mesh.positions.length / 3;
  const sum = new Float64Array(nV);
  const corners = new Uint32Array(nV);
  const tri = mesh.triangles;
  for (let c = 0; c < tri.length; c++) {
    const v = tri[c];
    sum[v] += sample(image, uv[2 * c], uv[2 * c + 1]);
    corners[v]++;
  }
  const out = new Float64Array(nV);
  for (let v = 0; v < nV; v++) {
    // A vertex on no triangle has no UV; it weighs on nothing, so black is as good as any.
    const p = corners[v] > 0 ? sum[v] / corners[v] / image.top : 0;
    out[v] = p === 0 ? low : p === 1 ? high : low + (high - low) * p;
  }
  return out;
}

/** The channel at (u, v), bilinear between pixel centres, repeating outside [0, 1]. */
function sample(image: Channel, u: number, v: number): number {
  const { width, height } = image;
  const x = (u - Math.floor(u)) * width - 0.5;
  const y = (1 - (v - Math.floor(v))) * height - 0.5;
  const x0 = Math.floor(x), y0 = Math.floor(y);
  const fx = x - x0, fy = y - y0;
  const wrap = (k: number, n: number) => ((k % n) + n) % n;
  const xa = wrap(x0, width), xb = wrap(x0 + 1, width), ya = wrap(y0, height), yb = wrap(y0 + 1, height);
  const top = image.at(xa, ya) * (1 - fx) + image.at(xb, ya) * fx;
  const bottom = image.at(xa, yb) * (1 - fx) + image.at(xb, yb) * fx;
  return fx === 0 && fy === 0 ? image.at(xa, ya) : top * (1 - fy) + bottom * fy;
}
