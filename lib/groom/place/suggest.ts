import { suggestLayout, type SuggestAlignment, type SuggestedLayout } from '../../field';
import { GroomError } from '../errors';
import { parseGroomSpec, type GroomSpec, type GroomSpecInput } from '../spec/spec';
import type { GroomSurface } from './surface';

/** Most singularities a spec holds (its schema's limit). */
const MAX_SPEC_SINGULARITIES = 256;

/**
 * For each welded vertex, the first vertex of the surface file that became it, so a spec names the
 * vertex the way the file numbers it (`vertex` in the spec is a file vertex; welding maps every
 * duplicate back to the same welded vertex, so any of them would do).
 */
export function fileVertexOfVertex(surface: GroomSurface): Int32Array {
  const count = surface.field.topology.vertexCount;
  const map = surface.mesh.fileVertexToVertex;
  const out = new Int32Array(count).fill(-1);
  if (!map) {
    for (let v = 0; v < count; v++) out[v] = v;
    return out;
  }
  for (let fileVertex = 0; fileVertex < map.length; fileVertex++) {
    if (out[map[fileVertex]] === -1) out[map[fileVertex]] = fileVertex;
  }
  return out;
}

/**
 * A groom spec whose singularities are a suggested layout's: the base spec (units, guides, pins,
 * boundary; its partings, crests and strokes dropped, since the suggestion did not see them) with
 * `field.singularities` replaced by the suggestion's, each by file vertex with no twist.
 *
 * Guarantees: the spec parses; `fieldRequestFromSpec` of it on the same surface asks for exactly
 * the suggested singularities at exactly the suggested vertices. Throws GroomError
 * `too-many-singularities` when the suggestion has more than a spec holds (a noisy surface).
 */
export function specFromSuggestion(surface: GroomSurface, layout: SuggestedLayout, base: GroomSpec | GroomSpecInput): GroomSpec {
  if (layout.singularities.length > MAX_SPEC_SINGULARITIES) {
    throw new GroomError(
      'too-many-singularities',
      `The suggestion has ${layout.singularities.length} singularities, more than a groom spec holds (${MAX_SPEC_SINGULARITIES}); the surface is probably noisy. Smooth it, or pull the suggestion toward a direction.`,
      'field.singularities',
    );
  }
  const fileVertex = fileVertexOfVertex(surface);
  const field = base.field ?? {};
  return parseGroomSpec({
    ...base,
    field: {
      ...field,
      order: layout.order,
      boundary: surface.field.boundary,
      singularities: layout.singularities.map((s) => ({ vertex: fileVertex[s.vertex], index: s.index })),
      partings: [],
      crests: [],
      strokes: [],
    },
  });
}

/**
 * Suggests a layout on a prepared groom surface and returns it with its spec.
 *
 * Guarantees: as `suggestLayout` and `specFromSuggestion`; the alignment direction, when given, is
 * in world coordinates of the surface file.
 */
export function suggestGroomSpec(
  surface: GroomSurface,
  base: GroomSpec | GroomSpecInput,
  options: { order: number; align?: SuggestAlignment },
): { spec: GroomSpec; layout: SuggestedLayout } {
  const layout = suggestLayout(surface.field, { order: options.order, align: options.align });
  return { spec: specFromSuggestion(surface, layout, base), layout };
}
