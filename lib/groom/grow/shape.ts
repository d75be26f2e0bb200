/**
 * The shape of one guide over its skin path: lifted off the skin, bent by gravity, curled and
 * jittered. The first segment is the groomed root direction itself — the field's direction tilted
 * off the skin by the lift — and every bend starts after it, so what the groomer combed at the
 * root is what the renderer receives.
 */
export interface ShapeParameters {
  /** Guide length along the combed curve, in surface units. */
  readonly length: number;
  /** Angle off the skin, radians, 0 … π/2. */
  readonly lift: number;
  /** 0 … 1: how far the tip turns toward gravity (1: the last segment points straight down). */
  readonly droop: number;
  /** Unit direction of gravity. */
  readonly gravity: readonly [number, number, number];
  /** Curl radius and wavelength (surface units), and the guide's own phase (radians). */
  readonly curlAmplitude: number;
  readonly curlWavelength: number;
  readonly curlPhase: number;
  /** Sideways offset of the tip from the jitter (surface units), and the direction it leans (radians around the guide). */
  readonly jitterOffset: number;
  readonly jitterAngle: number;
  /** Height the guide keeps above the skin, surface units. */
  readonly clearance: number;
  /**
   * The guide is the mirror image of one grown with these parameters (mirror symmetry): its curl
   * and lean are that guide's reflected — the curl turns the other way round the guide.
   */
  readonly mirrored?: boolean;
}

/**
 * Writes the guide's `n` points into `out` from index `at` (3 numbers each).
 *
 * `skin` holds for i = 1 … n−1 the skin point under point i (at arc length s_i·cos(lift) along the
 * field's streamline) and `skinNormal` the unit skin normal there; `root`, `rootDirection` (unit
 * field direction) and `rootNormal` (unit face normal) describe the root.
 *
 * Guarantees: point 0 is the root; the segment from point 0 to point 1 is
 * s₁·(cos(lift)·rootDirection + sin(lift)·rootNormal) + clearance·rootNormal, so its part in the
 * skin's tangent plane points exactly along the field; droop turns segments without changing their
 * lengths; all points are finite when the inputs are.
 */
export function shapeGuide(
  out: Float64Array,
  at: number,
  n: number,
  root: ArrayLike<number>,
  rootDirection: ArrayLike<number>,
  rootNormal: ArrayLike<number>,
  skin: Float64Array,
  skinNormal: Float64Array,
  params: ShapeParameters,
): void {
  const { length, lift, clearance } = params;
  const step = length / (n - 1);
  const cosLift = Math.cos(lift), sinLift = Math.sin(lift);
  const o = 3 * at;
  for (let k = 0; k < 3; k++) out[o + k] = root[k];
  if (n === 1) return;
  for (let k = 0; k < 3; k++) out[o + 3 + k] = root[k] + step * (cosLift * rootDirection[k] + sinLift * rootNormal[k]) + clearance * rootNormal[k];
  // The combed curve: each later point stands over its skin point at the height the lift gives.
  for (let i = 2; i < n; i++) {
    const height = i * step * sinLift + clearance;
    for (let k = 0; k < 3; k++) out[o + 3 * i + k] = skin[3 * i + k] + height * skinNormal[3 * i + k];
  }
  droop(out, o, n, params);
  bend(out, o, n, step, skinNormal, params);
}

const axis = new Float64Array(3);
const side = new Float64Array(3);

/**
 * The unit vector along a × b into `out`; where a and b are (nearly) parallel, any unit vector
 * perpendicular to b, so that a bend always has a plane to happen in.
 */
function unitCross(ax: number, ay: number, az: number, bx: number, by: number, bz: number, out: Float64Array): void {
  let x = ay * bz - az * by, y = az * bx - ax * bz, z = ax * by - ay * bx;
  let l = Math.sqrt(x * x + y * y + z * z);
  if (l < 1e-9) {
    const small = Math.abs(bx) < 0.9;
    x = small ? 0 : -bz; y = small ? -bz : 0; z = small ? by : bx;
    l = Math.sqrt(x * x + y * y + z * z) || 1;
  }
  out[0] = x / l; out[1] = y / l; out[2] = z / l;
}

/** Turns segments 1 … n−2 toward gravity, more toward the tip, keeping each segment's length. */
function droop(out: Float64Array, o: number, n: number, params: ShapeParameters): void {
  if (params.droop <= 0 || n < 3) return;
  const [gx, gy, gz] = params.gravity;
  // Positions are rebuilt segment by segment from the original segment vectors.
  let px = out[o + 3], py = out[o + 4], pz = out[o + 5];
  let prevX = px, prevY = py, prevZ = pz;
  for (let i = 2; i < n; i++) {
    const cx = out[o + 3 * i], cy = out[o + 3 * i + 1], cz = out[o + 3 * i + 2];
    let sx = cx - prevX, sy = cy - prevY, sz = cz - prevZ;
    prevX = cx; prevY = cy; prevZ = cz;
    const len = Math.sqrt(sx * sx + sy * sy + sz * sz);
    if (len > 0) {
      const ux = sx / len, uy = sy / len, uz = sz / len;
      const angle = Math.acos(Math.max(-1, Math.min(1, ux * gx + uy * gy + uz * gz)));
      const turn = params.droop * ((i - 1) / (n - 2)) * angle;
      // Rotation of u toward g in the plane they span (any plane when they are opposite).
      unitCross(ux, uy, uz, gx, gy, gz, axis);
      const ax = axis[0], ay = axis[1], az = axis[2];
      const c = Math.cos(turn), s = Math.sin(turn);
      // Rodrigues' rotation; u is perpendicular to the axis.
      const wx = ay * uz - az * uy, wy = az * ux - ax * uz, wz = ax * uy - ay * ux;
      sx = len * (c * ux + s * wx); sy = len * (c * uy + s * wy); sz = len * (c * uz + s * wz);
    }
    px += sx; py += sy; pz += sz;
    out[o + 3 * i] = px; out[o + 3 * i + 1] = py; out[o + 3 * i + 2] = pz;
  }
}

/**
 * Adds curl (a helix around the guide) and jitter (a sideways lean of the tip), both zero up to
 * point 1. With `mirrored`, the offsets are the mirror images of those the same parameters give
 * the mirrored guide (the same phase, lean angle and length; the helix's handedness reversed).
 */
function bend(out: Float64Array, o: number, n: number, step: number, skinNormal: Float64Array, params: ShapeParameters): void {
  const { curlAmplitude, curlWavelength, curlPhase, jitterOffset, jitterAngle } = params;
  if ((curlAmplitude <= 0 && jitterOffset <= 0) || n < 3) return;
  const span = (n - 2) * step;
  // Offsets are computed on the unbent curve first, then applied, so each frame sees the same curve.
  const offsets = new Float64Array(3 * n);
  for (let i = 2; i < n; i++) {
    const q = o + 3 * i;
    let tx = out[q] - out[q - 3], ty = out[q + 1] - out[q - 2], tz = out[q + 2] - out[q - 1];
    const tl = Math.sqrt(tx * tx + ty * ty + tz * tz) || 1;
    tx /= tl; ty /= tl; tz /= tl;
    const nx = skinNormal[3 * i], ny = skinNormal[3 * i + 1], nz = skinNormal[3 * i + 2];
    // Sideways (skin normal × tangent) and its partner, both across the guide.
    unitCross(nx, ny, nz, tx, ty, tz, side);
    const bx = side[0], by = side[1], bz = side[2];
    const cx = ty * bz - tz * by, cy = tz * bx - tx * bz, cz = tx * by - ty * bx;
    const s = (i - 1) * step;
    let a = 0, b = 0;
    if (curlAmplitude > 0) {
      // The helix grows to its full radius over the first half wavelength, so the root stays combed.
      const ramp = Math.min(1, s / (0.5 * curlWavelength));
      const phase = curlPhase + (2 * Math.PI * s) / curlWavelength;
      a += curlAmplitude * ramp * Math.cos(phase);
      b += curlAmplitude * ramp * Math.sin(phase);
    }
    if (jitterOffset > 0) {
      const lean = jitterOffset * (s / span) ** 2;
      a += lean * Math.cos(jitterAngle);
      b += lean * Math.sin(jitterAngle);
    }
    // A reflection maps the frame (side, partner) of a guide to (−side′, partner′) of its mirror
    // (the side is normal × tangent, and a reflection reverses cross products), so the mirror of
    // the offset a·side + b·partner is −a·side′ + b·partner′.
    if (params.mirrored) a = -a;
    offsets[3 * i] = a * bx + b * cx; offsets[3 * i + 1] = a * by + b * cy; offsets[3 * i + 2] = a * bz + b * cz;
  }
  for (let i = 2; i < n; i++) for (let k = 0; k < 3; k++) out[o + 3 * i + k] += offsets[3 * i + k];
}

/** Scratch for the wander's offsets: 3 per point of the longest guide the spec allows (64 points). */
const waverOffsets = new Float64Array(3 * 64);

/** The wander of one guide: its largest offset (surface units, at the tip), waves along it, and its own random values. */
export interface WaverParameters {
  readonly amplitude: number;
  readonly waves: number;
  /** Two values in [−1, 1] per knot (knot k at k waves along the guide), at least ⌈waves⌉ + 2 knots. */
  readonly knots: Float64Array;
}

/**
 * Wanders the guide's points 2 … n−1 across the guide: a smooth noise (values at one knot per
 * wave, joined by smoothstep) in the two directions across it, scaled by the share of the way to
 * the tip so the root stays combed.
 *
 * Guarantees: points 0 and 1 are not moved; no point moves by more than amplitude · √2; with an
 * amplitude of 0 nothing is touched; the same parameters give the same points.
 */
export function waver(out: Float64Array, at: number, n: number, rootNormal: ArrayLike<number>, params: WaverParameters): void {
  const { amplitude, waves, knots } = params;
  if (!(amplitude > 0) || n < 3) return;
  const o = 3 * at;
  const offsets = waverOffsets;
  for (let i = 2; i < n; i++) {
    const q = o + 3 * i;
    let tx = out[q] - out[q - 3], ty = out[q + 1] - out[q - 2], tz = out[q + 2] - out[q - 1];
    const tl = Math.sqrt(tx * tx + ty * ty + tz * tz) || 1;
    tx /= tl; ty /= tl; tz /= tl;
    unitCross(rootNormal[0], rootNormal[1], rootNormal[2], tx, ty, tz, side);
    const bx = side[0], by = side[1], bz = side[2];
    const cx = ty * bz - tz * by, cy = tz * bx - tx * bz, cz = tx * by - ty * bx;
    const s = i / (n - 1);
    const t = s * waves;
    const k = Math.floor(t), u = t - k, e = u * u * (3 - 2 * u);
    const a = amplitude * s * (knots[2 * k] + e * (knots[2 * k + 2] - knots[2 * k]));
    const b = amplitude * s * (knots[2 * k + 1] + e * (knots[2 * k + 3] - knots[2 * k + 1]));
    offsets[3 * i] = a * bx + b * cx; offsets[3 * i + 1] = a * by + b * cy; offsets[3 * i + 2] = a * bz + b * cz;
  }
  for (let i = 2; i < n; i++) for (let k = 0; k < 3; k++) out[o + 3 * i + k] += offsets[3 * i + k];
}
