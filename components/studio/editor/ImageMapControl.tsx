'use client';
// A painted map from an image: the groomer picks a PNG or TIFF (8 or 16 bits), what it drives and
// the factors of black and white; the server lays it onto the surface through its UVs and the map
// enters the groom as one undoable edit (autosaved, and the guides grow again).
import { useRef, useState } from 'react';
import { MAP_ATTRIBUTES, type GroomSpec, type MapAttribute } from '@/lib/groom/spec/spec';
import { postJson } from '@/lib/http/client';
import { fileToBase64, imageMapEdit } from '@/lib/studio/client/image-maps';
import type { ImageMapResponse } from '@/lib/studio/types';
import { MAP_IMAGE_MAX_BYTES } from '@/lib/studio/validation';
import { NumberField } from '../ui/NumberField';
import type { EditorActions } from './editor-actions';
import { MapAttributeSelect } from './MapAttributeSelect';

export function ImageMapControl({ spec, surfaceId, actions }: { spec: GroomSpec; surfaceId: string; actions: EditorActions }) {
  const latest = useRef(spec);
  latest.current = spec;
  const [file, setFile] = useState<File | null>(null);
  const [attribute, setAttribute] = useState<MapAttribute>('length');
  const [low, setLow] = useState(0);
  const [high, setHigh] = useState(1);
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<{ text: string; refused: boolean } | null>(null);

  async function lay() {
    if (!file) return setMessage({ text: 'Choose a PNG or TIFF image first.', refused: true });
    if (file.size > MAP_IMAGE_MAX_BYTES) return setMessage({ text: `The image is larger than ${MAP_IMAGE_MAX_BYTES / 1_000_000} MB; use a smaller one.`, refused: true });
    setBusy(true);
    setMessage(null);
    const answer = await postJson<ImageMapResponse>(`/api/studio/surfaces/${surfaceId}/image-map`, { attribute, low, high, image: await fileToBase64(file) });
    setBusy(false);
    if (!answer.ok) {
      const fields = answer.error.fields ? Object.values(answer.error.fields).join(' ') : '';
      return setMessage({ text: fields || answer.error.message, refused: true });
    }
    const refused = actions.edit(imageMapEdit(latest.current, answer.data.map, file.name));
    setMessage(refused ? { text: refused, refused: true } : { text: `The ${attribute} map from ${file.name} is on the groom.`, refused: false });
  }

  return (
    <fieldset className="flex flex-col gap-2 rounded-xl border-2 border-vellum px-3 py-2" aria-label="A map from an image">
      <legend className="px-1 text-xs font-bold uppercase tracking-[0.12em] text-bracken">A map from an image</legend>
      <p className="text-xs text-loam-soft">A PNG or TIFF (8 or 16 bits; grey, or the red of a colour image) laid on through the surface’s UVs: black gives the low factor, white the high.</p>
      <label className="flex flex-col gap-1 text-xs font-semibold text-loam-soft">
        Image
        <input type="file" accept=".png,.tif,.tiff,image/png,image/tiff" onChange={(event) => setFile(event.target.files?.[0] ?? null)} className="text-sm text-loam" />
      </label>
      <MapAttributeSelect label="The map drives" value={attribute} options={MAP_ATTRIBUTES} onChange={setAttribute} />
      <div className="grid grid-cols-2 gap-2">
        <NumberField label="Black (factor)" unit="×" value={low} min={0} max={10} onCommit={(v) => (v > high ? 'Use no more than the white factor.' : setLow(v))} />
        <NumberField label="White (factor)" unit="×" value={high} min={0} max={10} onCommit={(v) => (v < low ? 'Use no less than the black factor.' : setHigh(v))} />
      </div>
      <button type="button" disabled={busy} onClick={lay} className="self-start rounded-full border-2 border-tarn/25 px-3 py-1 text-xs font-semibold text-tarn hover:border-tarn disabled:opacity-50">
        {busy ? 'Laying the image on…' : 'Lay the image on the surface'}
      </button>
      {message && (
        <p role={message.refused ? 'alert' : 'status'} className={`text-xs ${message.refused ? 'font-medium text-hawthorn' : 'text-loam-soft'}`} data-testid="image-map-message">
          {message.text}
        </p>
      )}
    </fieldset>
  );
}
