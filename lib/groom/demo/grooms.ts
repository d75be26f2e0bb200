import type { TriangleMesh } from '../../field';
import type { GroomSpecInput } from '../spec/spec';
import { CAT, FOX, RING, foxHead, longCat, plushRing } from './surfaces';

/**
 * The demo studio, Quillmoor Coatwrights, and its three characters, each with a growth
 * surface and a groom spec that solves on it. The demo seed and the tests use these.
 */
export const DEMO_STUDIO = 'Quillmoor Coatwrights';

export interface DemoGroom {
  readonly id: string;
  readonly character: string;
  readonly description: string;
  readonly surface: () => TriangleMesh;
  readonly spec: GroomSpecInput;
}

const round = (v: readonly number[]): [number, number, number] => [v[0], v[1], v[2]].map((x) => Math.round(x * 1000) / 1000) as [number, number, number];

export const DEMO_GROOMS: readonly DemoGroom[] = [
  {
    id: 'bramble-fox-head',
    character: 'Bramble',
    description: 'A stylised fox head: fur streams back from the nose over a spiral cowlick on the crown to a whorl at the nape, with long tufts on the ears.',
    surface: () => foxHead(),
    spec: {
      specVersion: 2,
      name: 'Bramble — autumn coat',
      units: 'cm',
      upAxis: 'y',
      field: {
        singularities: [
          { point: round(FOX.at(FOX.muzzle)), index: 1, twist: 0 },
          { point: round(FOX.at([0, -0.3, -1])), index: 1, twist: 180 },
          { point: round(FOX.at([0.12, 1, -0.45])), index: 1, twist: 55, handedness: 'clockwise' },
          { point: round(FOX.at([0, 0.45, 0.9])), index: -1 },
        ],
        strokes: [{ points: [round(FOX.at([0.8, -0.1, 0.6])), round(FOX.at([0.95, -0.15, 0.1])), round(FOX.at([0.85, -0.2, -0.4]))] }],
      },
      guides: {
        density: 3,
        regions: ['muzzle', 'ears', 'crown'],
        length: 1.6,
        lift: 18,
        droop: 0.25,
        curl: { amplitude: 0.03, wavelength: 0.6 },
        jitter: 0.2,
        pointsPerGuide: 16,
        seed: 11,
        width: 0.012,
        hairsPerGuide: 60,
      },
      pins: [
        { attribute: 'length', point: round(FOX.at(FOX.ears[0])), value: 2.2 },
        { attribute: 'length', point: round(FOX.at(FOX.ears[1])), value: 2.2 },
        { attribute: 'length', point: round(FOX.at(FOX.muzzle)), value: 0.35 },
      ],
    },
  },
  {
    id: 'brisquette-long-cat',
    character: 'Brisquette',
    description: 'A long-bodied cat: a parting runs down the spine, fur flows from the nose along the flanks to the tail end, turning at a saddle on the chest.',
    surface: () => longCat(),
    spec: {
      specVersion: 2,
      name: 'Brisquette — short velvet',
      units: 'cm',
      upAxis: 'y',
      field: {
        singularities: [
          { point: round(CAT.at(0, 0)), index: 1, twist: 0 },
          { point: round(CAT.at(Math.PI, 0)), index: 1, twist: 180 },
          { point: round(CAT.at(0.3 * Math.PI, -Math.PI / 2)), index: -1 },
        ],
        partings: [{ points: [round(CAT.at(0.35 * Math.PI, Math.PI / 2)), round(CAT.at(0.55 * Math.PI, Math.PI / 2)), round(CAT.at(0.7 * Math.PI, Math.PI / 2))] }],
      },
      guides: {
        density: 1.5,
        length: 1.2,
        lift: 12,
        droop: 0.4,
        jitter: 0.15,
        pointsPerGuide: 12,
        seed: 3,
        width: 0.01,
        hairsPerGuide: 120,
      },
      pins: [{ attribute: 'lift', point: round(CAT.at(Math.PI / 2, -Math.PI / 2)), value: 0.5 }],
    },
  },
  {
    id: 'loop-plush-ring',
    character: 'Loop',
    description: 'A plush ring toy: long shaggy pile wrapping around the tube, with one whorl on top and its saddle on the underside.',
    surface: () => plushRing(),
    spec: {
      specVersion: 2,
      name: 'Loop — shaggy pile',
      units: 'mm',
      upAxis: 'z',
      field: {
        singularities: [
          { point: round(RING.at(0.3, Math.PI / 2)), index: 1, twist: 90 },
          { point: round(RING.at(Math.PI + 0.3, -Math.PI / 2)), index: -1 },
        ],
        strokes: [{ points: [0.6, 0.75, 0.9, 1.05].map((u) => round(RING.at(u, 0))) }],
      },
      guides: {
        density: 4,
        length: 14,
        lift: 35,
        droop: 0.5,
        curl: { amplitude: 1.2, wavelength: 6 },
        jitter: 0.4,
        pointsPerGuide: 16,
        seed: 21,
        width: 0.3,
        hairsPerGuide: 40,
      },
    },
  },
];
