'use client';
// Uploading a growth surface: the file goes straight to object storage through the presigned
// link the studio API hands out (with its real progress), then a job on the server checks it with
// lib/field, its stage and progress shown here and in the list. A refused file is reported problem
// by problem, with its bad faces shown when it can be drawn.
import { useRef, useState, type FormEvent } from 'react';
import { Notice } from '@/components/ui/Notice';
import { SURFACE_FORMATS, SURFACE_UNITS, extensionOf, formatBytes, studioApi, uploadFile, type SurfaceProblem, type SurfaceSummary, type SurfaceUnits } from '@/lib/studio/client/api';
import { nameFromFile } from '@/lib/studio/client/format';
import { ProgressBar } from '../ui/ProgressBar';
import { ProblemReport } from './ProblemReport';

type Errors = Partial<Record<'file' | 'name' | 'units', string>>;
type Stage = { step: 'idle' } | { step: 'uploading'; fraction: number } | { step: 'checking'; label: string; fraction: number | null };

/** How often the check's progress is read while it runs. */
const CHECK_POLL_MS = 500;

const UNIT_WORDS: Record<SurfaceUnits, string> = { mm: 'millimetres', cm: 'centimetres', m: 'metres', in: 'inches' };

export function SurfaceUpload({ maxBytes, onUploaded }: { maxBytes: number; onUploaded: (surface: SurfaceSummary) => void }) {
  const form = useRef<HTMLFormElement>(null);
  const [file, setFile] = useState<File | null>(null);
  const [name, setName] = useState('');
  const [nameTouched, setNameTouched] = useState(false);
  const [units, setUnits] = useState<SurfaceUnits>('cm');
  const [errors, setErrors] = useState<Errors>({});
  const [stage, setStage] = useState<Stage>({ step: 'idle' });
  const [failure, setFailure] = useState<string | null>(null);
  const [rejected, setRejected] = useState<{ fileName: string; message: string; problems: SurfaceProblem[]; file: File } | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const busy = stage.step !== 'idle';

  function checkFile(picked: File | null): string | undefined {
    if (!picked) return 'Choose the surface file to upload.';
    if (!(SURFACE_FORMATS as readonly string[]).includes(extensionOf(picked.name))) return `Upload an OBJ, PLY, STL, glTF or GLB file (.${SURFACE_FORMATS.join(', .')}); “${picked.name}” is not one.`;
    if (picked.size === 0) return 'The file is empty.';
    if (picked.size > maxBytes) return `The file is ${formatBytes(picked.size)}; the limit is ${formatBytes(maxBytes)}. Decimate it before uploading.`;
    return undefined;
  }

  function validate(): Errors {
    const found: Errors = {};
    const fileError = checkFile(file);
    if (fileError) found.file = fileError;
    if (name.trim().length === 0) found.name = 'Give the surface a name.';
    else if (name.trim().length > 200) found.name = 'Use a name of at most 200 characters.';
    return found;
  }

  async function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const found = validate();
    setErrors(found);
    setFailure(null);
    setDone(null);
    setRejected(null);
    if (Object.keys(found).length > 0 || !file) return;

    setStage({ step: 'uploading', fraction: 0 });
    const ticket = await studioApi.requestUpload(file.name, file.size);
    if (!ticket.ok) {
      setStage({ step: 'idle' });
      const fields = ticket.error.fields ?? {};
      if (fields.fileName || fields.byteSize) return setErrors({ file: fields.fileName ?? fields.byteSize });
      return setFailure(ticket.error.message);
    }
    const sent = await uploadFile(ticket.data, file, (fraction) => setStage({ step: 'uploading', fraction }));
    if (sent) {
      setStage({ step: 'idle' });
      return setFailure(sent);
    }
    setStage({ step: 'checking', label: 'Queued for its check…', fraction: null });
    const registered = await studioApi.createSurface({ uploadId: ticket.data.uploadId, name: name.trim(), units });
    if (!registered.ok) {
      setStage({ step: 'idle' });
      const problems = registered.error.details?.problems;
      if (registered.error.code === 'surface-rejected' && Array.isArray(problems)) {
        return setRejected({ fileName: file.name, message: registered.error.message, problems: problems as SurfaceProblem[], file });
      }
      if (registered.error.fields) return setErrors({ name: registered.error.fields.name, units: registered.error.fields.units });
      return setFailure(registered.error.message);
    }
    onUploaded(registered.data.surface);
    // The check runs as a job: its stage is read until it has ended.
    let surface = registered.data.surface;
    while (surface.state === 'checking') {
      setStage({ step: 'checking', label: `Checking the surface: ${surface.check.stage}…`, fraction: surface.check.progress > 0 ? surface.check.progress : null });
      await new Promise((resolve) => setTimeout(resolve, CHECK_POLL_MS));
      const latest = await studioApi.getSurface(surface.id);
      if (!latest.ok) {
        setStage({ step: 'idle' });
        return setFailure(latest.error.message);
      }
      surface = latest.data.surface;
    }
    setStage({ step: 'idle' });
    if (surface.state === 'refused') {
      const errors = surface.problems.filter((problem) => problem.severity === 'error');
      onUploaded(surface);
      return setRejected({ fileName: file.name, message: `${file.name} cannot be used as a growth surface: ${errors.map((problem) => problem.message).join(' ')}`, problems: surface.problems, file });
    }
    if (surface.state !== 'ready') return;
    setDone(`${surface.name} is ready: ${surface.faceCount.toLocaleString('en-GB')} faces.`);
    onUploaded(surface);
    form.current?.reset();
    setFile(null);
    setName('');
    setNameTouched(false);
  }

  return (
    <div className="flex flex-col gap-4">
      <form ref={form} onSubmit={submit} noValidate className="flex flex-col gap-4 rounded-3xl bg-vellum p-5" aria-labelledby="upload-heading">
        <div className="flex flex-wrap items-baseline justify-between gap-2">
          <h3 id="upload-heading" className="text-lg font-bold">
            Upload a growth surface
          </h3>
          <p className="text-sm text-loam-soft" data-testid="upload-limit">
            OBJ, PLY, STL, glTF or GLB · up to {formatBytes(maxBytes)}
          </p>
        </div>
        <div className="grid gap-4 md:grid-cols-[1.4fr_1fr_0.8fr]">
          <div className="flex flex-col gap-1.5">
            <label htmlFor="surface-file" className="text-sm font-semibold text-loam">
              Surface file
            </label>
            <input
              id="surface-file"
              name="file"
              type="file"
              accept={SURFACE_FORMATS.map((f) => `.${f}`).join(',')}
              disabled={busy}
              aria-invalid={errors.file ? true : undefined}
              aria-describedby={errors.file ? 'surface-file-error' : 'surface-file-hint'}
              onChange={(event) => {
                const picked = event.target.files?.[0] ?? null;
                setFile(picked);
                setErrors((e) => ({ ...e, file: picked ? checkFile(picked) : undefined }));
                if (picked && !nameTouched) setName(nameFromFile(picked.name));
              }}
              className="rounded-xl border-2 border-vellum bg-white px-3 py-2 text-sm file:mr-3 file:rounded-full file:border-0 file:bg-tarn file:px-3 file:py-1 file:text-chalk"
            />
            {errors.file ? (
              <p id="surface-file-error" className="text-sm font-medium text-hawthorn" data-field-error="file">
                {errors.file}
              </p>
            ) : (
              <p id="surface-file-hint" className="text-sm text-loam-soft">
                {file ? `${file.name}, ${formatBytes(file.size)}` : 'A closed or open triangle mesh; polygons are split.'}
              </p>
            )}
          </div>
          <div className="flex flex-col gap-1.5">
            <label htmlFor="surface-name" className="text-sm font-semibold text-loam">
              Name
            </label>
            <input
              id="surface-name"
              name="name"
              value={name}
              disabled={busy}
              maxLength={220}
              aria-invalid={errors.name ? true : undefined}
              aria-describedby={errors.name ? 'surface-name-error' : undefined}
              onChange={(event) => {
                setName(event.target.value);
                setNameTouched(true);
                if (errors.name) setErrors((e) => ({ ...e, name: event.target.value.trim() ? undefined : e.name }));
              }}
              className={`rounded-xl border-2 bg-white px-3 py-2 text-base text-loam ${errors.name ? 'border-hawthorn' : 'border-vellum focus:border-tarn'}`}
            />
            {errors.name && (
              <p id="surface-name-error" className="text-sm font-medium text-hawthorn" data-field-error="name">
                {errors.name}
              </p>
            )}
          </div>
          <div className="flex flex-col gap-1.5">
            <label htmlFor="surface-units" className="text-sm font-semibold text-loam">
              Units of the file
            </label>
            <select id="surface-units" name="units" value={units} disabled={busy} onChange={(event) => setUnits(event.target.value as SurfaceUnits)} className="rounded-xl border-2 border-vellum bg-white px-3 py-2.5 text-base text-loam">
              {SURFACE_UNITS.map((u) => (
                <option key={u} value={u}>
                  {UNIT_WORDS[u]} ({u})
                </option>
              ))}
            </select>
            {errors.units && <p className="text-sm font-medium text-hawthorn">{errors.units}</p>}
          </div>
        </div>
        <div className="flex flex-wrap items-center gap-4">
          <button type="submit" disabled={busy} className="rounded-full bg-bracken px-5 py-2.5 text-sm font-semibold text-chalk hover:bg-bracken-deep disabled:bg-bracken/50">
            {busy ? 'Working…' : 'Upload and check'}
          </button>
          <div className="min-w-64 flex-1" aria-live="polite">
            {stage.step === 'uploading' && <ProgressBar label={`Uploading ${file?.name ?? ''}`} fraction={stage.fraction} />}
            {stage.step === 'checking' && <ProgressBar label={stage.label} fraction={stage.fraction} />}
          </div>
        </div>
      </form>
      {failure && <Notice tone="error">{failure}</Notice>}
      {done && <Notice tone="success">{done}</Notice>}
      {rejected && <ProblemReport fileName={rejected.fileName} problems={rejected.problems} file={rejected.file} message={rejected.message} />}
    </div>
  );
}
