import type { TriangleMesh } from '../../field';
import type { Unit } from '../spec/spec';
import type { RootBinding } from './binding';
import type { MirrorPlane } from '../spec/symmetry';

/** What growing makes: the guides and what was learnt on the way (growGuides, growGuideSets). */

/** One guide set's run of guides in a grown groom. */
export interface GuideSetRange {
  /** The set's name, as the spec gives it. */
  readonly name: string;
  /** Its first guide (guides of a set are stored together, in the spec's set order). */
  readonly first: number;
  readonly count: number;
  readonly hairsPerGuide: number;
  /** Its growth area in cm² (its region, weighted by density pins). */
  readonly areaSquareCm: number;
}

/**
 * A set of guides: every guide has the same number of points, stored guide after guide.
 * Everything an export needs travels with it, so exports are pure functions of this.
 */
export interface Guides {
  readonly count: number;
  readonly pointsPerGuide: number;
  /** x, y, z of every point, guide after guide (3 · count · pointsPerGuide numbers), in surface units. */
  readonly points: Float64Array;
  /**
   * Each guide's identity: its place in the surface's fixed order of roots (see roots.ts), so
   * the same surface, regions, density pins and seed give guide n the same root at any count or
   * density (a denser set keeps the sparser set's guides). Guides are stored in id order.
   */
  readonly guideId: Uint32Array;
  /** The face (of the welded, triangulated mesh) each root lies in. */
  readonly rootFace: Uint32Array;
  /** The root's weights on its face's three corners, in the face's corner order (3 per guide). */
  readonly rootBarycentric: Float64Array;
  /** Where each root lies in the surface file's own numbering: polygon, triangle, corners, weights, UV. */
  readonly binding: RootBinding;
  /** Arc length of each guide's polyline, in surface units. */
  readonly length: Float64Array;
  /** Why each guide's skin path ended (see `STOP` in trace.ts): it reached its length, or a boundary, singularity, curve or convergence. */
  readonly stop: Uint8Array;
  /** The spec's width at the root and at the tip, in surface units (widths taper linearly along each guide). */
  readonly rootWidth: number;
  readonly tipWidth: number;
  /** Each guide's own width at the root and at the tip (the spec's, times the width pins' factor at its root), surface units. */
  readonly guideRootWidth: Float64Array;
  readonly guideTipWidth: Float64Array;
  /** The tuft each guide is drawn into (its number among the tuft centres), −1 for none (no tufts, or a loner). */
  readonly tuft: Int32Array;
  /** The inner tuft (of the finer level) each guide is drawn into, −1 for none. */
  readonly innerTuft: Int32Array;
  readonly units: Unit;
  readonly upAxis: 'y' | 'z';
  /** How many rendered hairs each guide stands for. */
  readonly hairsPerGuide: number;
  /**
   * With guide sets: the sets in spec order, each a run of guides (`first`, `count`) with its own
   * name and hairs per guide; ids (`guideId`) are each set's own, so they repeat across sets.
   */
  readonly sets?: readonly GuideSetRange[];
  /** With guide sets: the set (its number in `sets`) each guide belongs to. */
  readonly guideSet?: Uint16Array;
}

export interface GrowResult {
  readonly guides: Guides;
  /** Area the guides grow on (the chosen regions, weighted by density pins), in cm². */
  readonly areaSquareCm: number;
  /** Points moved out from under the skin by the collision check (of the guides and of the tufts' centre curves). */
  readonly pushedOut: number;
  /**
   * With tufts: the centre curves guides were drawn onto (the inner level's when there is one; a
   * guide's curve is its `innerTuft`, else its `tuft`), n points each, and how many centres each level has.
   */
  readonly tufts?: { readonly curves: Float64Array; readonly centres: number; readonly innerCentres: number };
  /** Milliseconds by step; `tuftsMilliseconds` is the tufts' planning (sampling their centres, shaping their curves, assigning guides; their tracing is in `traceMilliseconds`). */
  readonly timings: { readonly rootsMilliseconds: number; readonly traceMilliseconds: number; readonly shapeMilliseconds: number; readonly tuftsMilliseconds: number };
}

export type GrowOptions = {
  /**
   * Grow at most this many guides, spread over the same area at the same relative density (a
   * picture of the coat, as thumbnails draw it, need not hold every guide).
   */
  readonly sampleOf?: number;
  /**
   * Sample the roots on this mesh and place them by face and weights on the surface: the mesh
   * the groom was first grown on, when the surface is a sculpt pass of it (same triangles, moved
   * vertices), so every guide keeps its id, polygon and weights. See `rootsOnSculpt`.
   */
  readonly rootsFrom?: TriangleMesh;
  /**
   * Make the roots mirror-symmetric across this plane (`mirroredRoots`: the positive side's roots
   * and their mirror images), for a coat whose two sides must mirror each other. The count is then
   * about the asked one (twice the positive side's share), and ids follow the kept roots' order.
   * The spec's `symmetry` does the same on its own (this names the plane when the spec has none,
   * and wins over it).
   */
  readonly mirrorRootsAcross?: MirrorPlane;
};

