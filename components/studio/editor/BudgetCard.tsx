'use client';
// Always in view: the index budget (what the surface demands by Poincaré–Hopf, what is placed,
// what remains, and one action to put the remainder where the groomer picks), and what the
// independent measurement of the solved field found — the proof that the field has exactly the
// singularities that were placed.
import type { GroomSpec } from '@/lib/groom/spec/spec';
import { formatIndex } from '@/lib/studio/client/features';
import type { OpenedSurface, SolveReport } from '@/lib/studio/client/protocol';

const count = (n: number, one: string, many = `${one}s`) => `${n.toLocaleString('en-GB')} ${n === 1 ? one : many}`;

export function BudgetCard({
  spec,
  surface,
  solve,
  placing,
  onPlaceRemainder,
  onPlaceRemainderAtCentre,
}: {
  spec: GroomSpec;
  surface: OpenedSurface | null;
  solve: SolveReport | null;
  placing: boolean;
  onPlaceRemainder: () => void;
  onPlaceRemainderAtCentre: () => void;
}) {
  const order = spec.field.order;
  const budget = solve?.budget ?? null;
  const several = (budget?.pieces.length ?? 0) > 1;
  const pointSum = spec.field.singularities.reduce((sum, s) => sum + s.index, 0);
  const openCurves = [...spec.field.partings, ...spec.field.crests].filter((c) => !c.closed).length;
  const proof = solve?.proof ?? null;
  const singularCount = spec.field.singularities.length;

  return (
    <section aria-labelledby="budget-heading" className="flex flex-col gap-3 rounded-2xl bg-tarn p-4 text-chalk" data-testid="index-budget">
      <h2 id="budget-heading" className="text-xs font-bold uppercase tracking-[0.15em] text-pollen">
        Index budget
      </h2>
      {!budget ? (
        <p className="text-sm text-chalk/80">{surface ? (solve?.error ? 'The budget needs every feature placed on the surface first.' : 'Working it out…') : 'Waiting for the surface.'}</p>
      ) : (
        budget.pieces.map((piece) => (
          <div key={piece.piece} className="flex flex-col gap-2" data-testid="budget-piece">
            {several && (
              <p className="text-xs font-semibold text-chalk/70">
                Piece {piece.piece + 1} of the surface{piece.borderedBy.length > 0 ? `, bordered by ${piece.borderedBy.join(' and ')}` : ''}
              </p>
            )}
            <dl className="grid grid-cols-3 gap-2 text-center">
              <div className="rounded-xl bg-tarn-deep px-2 py-1.5">
                <dt className="text-[11px] uppercase tracking-wide text-chalk/70">Surface asks</dt>
                <dd className="text-xl font-extrabold tabular-nums" data-testid="budget-demanded">
                  {piece.demanded === null ? 'any' : formatIndex(piece.demanded, order)}
                </dd>
              </div>
              <div className="rounded-xl bg-tarn-deep px-2 py-1.5">
                <dt className="text-[11px] uppercase tracking-wide text-chalk/70">Placed</dt>
                <dd className="text-xl font-extrabold tabular-nums" data-testid="budget-placed">
                  {formatIndex(piece.placed, order)}
                </dd>
              </div>
              <div className={`rounded-xl px-2 py-1.5 ${piece.remainder ? 'bg-pollen text-tarn-deep' : 'bg-tarn-deep'}`}>
                <dt className={`text-[11px] uppercase tracking-wide ${piece.remainder ? 'text-tarn-deep/80' : 'text-chalk/70'}`}>Remaining</dt>
                <dd className="text-xl font-extrabold tabular-nums" data-testid="budget-remainder">
                  {piece.remainder === null ? '—' : formatIndex(piece.remainder, order)}
                </dd>
              </div>
            </dl>
            {piece.demanded === null ? (
              <p className="text-xs text-chalk/75">The border of this piece is left free, so its indices may sum to anything.</p>
            ) : piece.remainder === 0 ? (
              <p className="text-xs text-chalk/75">Balanced: the placed indices sum to the Euler characteristic ({formatIndex(piece.demanded, order)}).</p>
            ) : (
              <div className="flex flex-col gap-2">
                <p className="text-xs text-chalk/85">
                  The indices must sum to {formatIndex(piece.demanded, order)}; {formatIndex(piece.remainder!, order)} is still to be placed somewhere.
                </p>
                <div className="flex flex-wrap gap-2">
                  <button type="button" onClick={onPlaceRemainder} aria-pressed={placing} className="rounded-full bg-pollen px-3.5 py-1.5 text-sm font-bold text-tarn-deep hover:bg-chalk">
                    {placing ? 'Click the surface…' : `Put ${formatIndex(piece.remainder!, order)} where I click`}
                  </button>
                  <button type="button" onClick={onPlaceRemainderAtCentre} className="rounded-full border-2 border-chalk/40 px-3.5 py-1.5 text-sm font-semibold hover:border-chalk">
                    At the middle of the view
                  </button>
                </div>
              </div>
            )}
          </div>
        ))
      )}
      <p className="text-xs text-chalk/70">
        Placed: {count(singularCount, 'singularity', 'singularities')} summing to {formatIndex(pointSum, order)}
        {openCurves > 0 ? `, ${count(openCurves, 'open parting or crest', 'open partings and crests')} (+1 each)` : ''}.
      </p>

      <div className="border-t border-chalk/20 pt-3" data-testid="index-proof" aria-live="polite">
        <h3 className="text-xs font-bold uppercase tracking-[0.15em] text-pollen">Measured on the field</h3>
        {proof ? (
          proof.strays === 0 && proof.mismatches === 0 ? (
            <p className="pt-1 text-sm">
              <span aria-hidden="true">✓ </span>
              {proof.nonZeroCount === 0
                ? `No singularity anywhere, as placed (${count(proof.measuredVertices, 'vertex', 'vertices')} measured).`
                : `${count(proof.nonZeroCount, 'singularity', 'singularities')} found, each exactly where one was placed; none elsewhere (${count(proof.measuredVertices, 'vertex', 'vertices')} measured).`}
              <span className="block pt-1 text-xs text-chalk/75" data-testid="edge-proof">
                No seam: {count(proof.checkedEdges, 'edge')} checked, the largest turn between neighbouring faces {proof.largestTurnDegrees}°
                {proof.checkedCurveTurns > 0 ? `; ${count(proof.checkedCurveTurns, 'turn')} round partings and crests as drawn` : ''}.
              </span>
            </p>
          ) : (
            <p className="pt-1 text-sm text-pollen">
              {proof.strays > 0 && `${count(proof.strays, 'stray singularity', 'stray singularities')} found where none was placed. `}
              {proof.mismatches > 0 && `${count(proof.mismatches, 'vertex', 'vertices')} measure differently from what was asked.`}
            </p>
          )
        ) : solve?.error ? (
          <p className="pt-1 text-sm text-chalk/80">No field to measure until it can be solved.</p>
        ) : solve?.quick ? (
          <p className="pt-1 text-sm text-chalk/80">Measuring when you let go…</p>
        ) : (
          <p className="pt-1 text-sm text-chalk/80">Measuring…</p>
        )}
      </div>
    </section>
  );
}
