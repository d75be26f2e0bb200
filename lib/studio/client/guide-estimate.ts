// How many guides a growth will make, said before it starts (the progress line "growing about N
// guides" and its expected time). Each guide set is counted on its own region — its groups, the
// side of its partings, or its painted mask — so a set grown on the ears is not counted as if it
// covered the whole head.
import { CENTIMETRES_PER_UNIT, decodeMap, growthMask, setRegionMask, type GroomSpec, type GroomSurface } from '@/lib/groom';
import type { GuideSettings } from '@/lib/groom/spec/spec';

/**
 * The number of guides growing `spec` on `surface` is expected to make: per block of settings
 * (each guide set, or the groom's one block) its `count`, or its density × its region's area in
 * cm², the area weighted by the painted density map as the root sampler weighs it (the mean of a
 * face's corners). Density pins are left out (blending them is a pass of fast marching per pin,
 * the growth's own work): with them the figure is an estimate only.
 *
 * Guarantees: a set's region is exactly the faces `setRegionMask` gives it (so a mask's faces,
 * a parting's side); a region that cannot be made (an unknown group, an empty mask, a parting
 * that does not separate) counts no guides — the growth refuses it in words; a density map on
 * another surface is left out. Never throws for a spec the schema accepts.
 */
export function expectedGuideCount(spec: GroomSpec, surface: GroomSurface): number {
  const density = densityFactors(spec, surface);
  const blocks: { guides: GuideSettings; mask: () => Uint8Array }[] = spec.guideSets
    ? spec.guideSets.map((set, i) => ({ guides: set.guides, mask: () => setRegionMask(surface, spec, set.region, `guideSets[${i}].region`) }))
    : [{ guides: spec.guides, mask: () => growthMask(surface.mesh, spec.guides.regions) }];
  const cm2PerUnit2 = CENTIMETRES_PER_UNIT[spec.units] ** 2;
  const tri = surface.mesh.triangles;
  return blocks.reduce((sum, { guides, mask }) => {
    if (guides.count !== undefined) return sum + guides.count;
    let faces: Uint8Array;
    try {
      faces = mask();
    } catch {
      return sum;
    }
    let area = 0;
    for (let f = 0; f < faces.length; f++) {
      if (!faces[f]) continue;
      area += surface.faceArea[f] * (density ? (density[tri[3 * f]] + density[tri[3 * f + 1]] + density[tri[3 * f + 2]]) / 3 : 1);
    }
    return sum + Math.round((guides.density ?? 1) * area * cm2PerUnit2);
  }, 0);
}

/** The painted density map per vertex, or null (none, or painted on another surface). */
function densityFactors(spec: GroomSpec, surface: GroomSurface): Float64Array | null {
  const index = spec.maps?.findIndex((m) => m.attribute === 'density') ?? -1;
  if (index < 0) return null;
  try {
    return decodeMap(spec.maps![index], surface.mesh, `maps[${index}]`);
  } catch {
    return null;
  }
}
