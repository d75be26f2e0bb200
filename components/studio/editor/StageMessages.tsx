'use client';
// What the stage says over the surface: the opening's progress or why it failed, why the field
// cannot be solved as placed, a notice about the last action, and the guides' progress.
import type { GroomSpec } from '@/lib/groom/spec/spec';
import { featureExists, featureLabel, type FeatureRef } from '@/lib/studio/client/features';
import { OPENING_STAGES, OPENING_STAGE_LABELS, type OpeningStages } from '@/lib/studio/client/opening-stages';
import type { WorkerError } from '@/lib/studio/client/protocol';
import { ProgressBar } from '../ui/ProgressBar';
import type { Task } from './hooks/useTask';

function capitaliseFirst(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

/**
 * A line per stage of the opening: done ones with their time, the current one, and those still to
 * come (stages passed over, such as the download of a demo character, are left out).
 */
function OpeningStageLines({ stages }: { stages: OpeningStages }) {
  const begun = OPENING_STAGES.filter((stage) => stages[stage]);
  const last = begun.length > 0 ? OPENING_STAGES.indexOf(begun[begun.length - 1]) : -1;
  const shown = OPENING_STAGES.filter((stage, i) => stages[stage] || i > last);
  return (
    <ol className="mt-3 flex flex-col gap-0.5 text-xs text-chalk/80" data-testid="opening-stages">
      {shown.map((stage) => {
        const times = stages[stage];
        const state = !times ? 'waiting' : times.endedAt === null ? 'running' : 'done';
        return (
          <li key={stage} className="flex justify-between gap-3" data-stage={stage} data-state={state}>
            <span className={state === 'running' ? 'font-semibold text-chalk' : ''}>{OPENING_STAGE_LABELS[stage]}</span>
            <span className="tabular-nums">{state === 'done' ? `${((times!.endedAt! - times!.startedAt) / 1000).toFixed(1)} s` : state === 'running' ? 'now' : ''}</span>
          </li>
        );
      })}
    </ol>
  );
}

export function StageMessages({ opened, previewed, solved, stages, opening, openError, fieldError, staleDrawing, errorFeature, spec, notice, onCloseNotice, guideTask }: {
  opened: boolean;
  /** The surface as read is drawn (its preparation still running): the progress moves out of its way. */
  previewed: boolean;
  /** The first solve has come: the opening is over. */
  solved: boolean;
  stages: OpeningStages;
  opening: Task | null;
  openError: string | null;
  fieldError: WorkerError | null;
  /** An earlier field (and guides) is still drawn, faded, behind the error. */
  staleDrawing: boolean;
  errorFeature: FeatureRef | null;
  spec: GroomSpec;
  notice: string | null;
  onCloseNotice: () => void;
  /** The guides' growth while it runs and they are shown. */
  guideTask: Task | null;
}) {
  return (
    <>
      {(opening || ((!opened || !solved) && !openError)) && (
        // Over the middle of the stage until the surface can be seen, then at its foot, out of the way.
        <div className={`pointer-events-none absolute inset-0 flex justify-center p-8 ${previewed || opened ? 'items-end' : 'items-center'}`}>
          <div className="pointer-events-auto w-full max-w-md rounded-2xl bg-tarn/90 p-5 shadow-xl" data-testid="opening-progress">
            <ProgressBar
              tone="dark"
              label={opening ? capitaliseFirst(opening.progress.stage) : opened ? 'Solving the field' : 'Starting the field worker'}
              fraction={opening?.progress.fraction ?? null}
              expectedMilliseconds={opening?.progress.expectedMilliseconds}
              startedAt={opening?.startedAt}
            />
            <OpeningStageLines stages={stages} />
          </div>
        </div>
      )}
      {openError && (
        <div className="absolute inset-0 flex items-center justify-center p-8">
          <div role="alert" className="max-w-lg rounded-2xl border-l-4 border-hawthorn bg-hawthorn-pale p-5 text-hawthorn">
            <p className="font-bold">The surface could not be opened.</p>
            <p className="text-sm">{openError}</p>
          </div>
        </div>
      )}
      {fieldError && opened && (
        <div role="alert" className="absolute inset-x-3 top-3 z-10 ml-auto max-w-xl rounded-xl border-l-4 border-hawthorn bg-hawthorn-pale/95 px-4 py-2.5 text-sm text-hawthorn shadow" data-testid="field-error">
          <strong>The field cannot be solved as placed{errorFeature && featureExists(spec, errorFeature) ? ` (${featureLabel(spec, errorFeature)})` : ''}.</strong> {fieldError.message}
          {staleDrawing && <span className="mt-1 block text-xs" data-testid="stale-field">The faint field and guides behind are the last ones that could be solved, not this groom as it stands.</span>}
        </div>
      )}
      {notice && (
        <div role="status" className="absolute bottom-16 left-1/2 z-10 flex max-w-lg -translate-x-1/2 items-start gap-3 rounded-xl bg-chalk px-4 py-2.5 text-sm text-loam shadow-lg">
          <span>{notice}</span>
          <button type="button" className="font-semibold text-tarn underline" onClick={onCloseNotice}>
            Close
          </button>
        </div>
      )}
      {opened && guideTask && (
        <div className="absolute bottom-3 right-3 w-72 rounded-xl bg-tarn/90 p-3 shadow" data-testid="guide-progress">
          <ProgressBar tone="dark" label={capitaliseFirst(guideTask.progress.stage)} fraction={guideTask.progress.fraction} expectedMilliseconds={guideTask.progress.expectedMilliseconds} startedAt={guideTask.startedAt} />
        </div>
      )}
    </>
  );
}
