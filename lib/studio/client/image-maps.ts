// A painted map read from an image (the server lays it on through the surface's UVs) put into the
// groom: one edit, undoable like every other, replacing any map of the same attribute. The words
// for what each map drives are here too, shared by the editor's control.
import type { GroomSpec, MapAttribute, MapSpec } from '@/lib/groom/spec/spec';
import type { SpecEdit } from './spec-edits';

/** What each map attribute drives, in the editor's words (the spec's own attribute names beside them). */
export const MAP_ATTRIBUTE_WORDS: Readonly<Record<MapAttribute, string>> = {
  density: 'Density (guides per area)',
  length: 'Length',
  width: 'Width (root and tip)',
  lift: 'Lift off the skin',
  droop: 'Droop',
  curl: 'Curl radius',
  jitter: 'Jitter',
  waver: 'Waver',
  gather: 'Gather into tufts',
  tuftDensity: 'Tufts (centres per area)',
  innerTuftDensity: 'Inner tufts (centres per area)',
  innerGather: 'Gather of inner tufts into their tuft',
  gatherRise: 'Gather’s rise (how late it closes)',
  loners: 'Loners (share outside tufts)',
  waves: 'Waves along the guide',
  tipWidth: 'Tip width',
};

/**
 * The edit that puts a map into the spec as one undoable step: the brush's own `set-map` edit (the
 * map of that attribute replaced in its place — the spec holds one per attribute — or added at the
 * end, every other map kept), labelled with the image it came from.
 */
export function imageMapEdit(spec: GroomSpec, map: MapSpec, fileName: string): SpecEdit {
  const replacing = (spec.maps ?? []).some((m) => m.attribute === map.attribute);
  return { type: 'set-map', map, label: `${replacing ? 'Replace' : 'Add'} the ${map.attribute} map from ${fileName}` };
}

/** The bytes of a file as base64 (RFC 4648), as the image map route takes them. */
export async function fileToBase64(file: Blob): Promise<string> {
  const bytes = new Uint8Array(await file.arrayBuffer());
  let text = '';
  const chunk = 0x8000;
  for (let i = 0; i < bytes.length; i += chunk) text += String.fromCharCode(...bytes.subarray(i, i + chunk));
  return btoa(text);
}
