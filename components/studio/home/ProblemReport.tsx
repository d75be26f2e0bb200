'use client';
// Why a surface was refused: each problem lib/field found, in its words, how many and where —
// and, when the file can still be drawn, a 3D view with the first bad faces marked.
import dynamic from 'next/dynamic';
import type { SurfaceProblem } from '@/lib/studio/client/api';
import { plural } from '@/lib/studio/client/format';

const ProblemView = dynamic(() => import('./ProblemView').then((m) => m.ProblemView), { ssr: false });

const WHERE: Record<SurfaceProblem['where'], [string, string]> = {
  face: ['face', 'faces'],
  vertex: ['vertex', 'vertices'],
  edge: ['edge', 'edges'],
  file: ['place in the file', 'places in the file'],
};

function examplesOf(problem: SurfaceProblem): string {
  if (problem.examples.length === 0 || problem.where === 'file') return '';
  // The file's own numbers when the check knew them (OBJ counts from 1), so the groomer finds
  // the same vertex in their modelling program.
  const numbers = problem.inFile ?? problem.examples;
  const numbering = problem.inFile ? ` (as the file numbers them, counting from ${problem.inFileFrom})` : '';
  if (problem.where === 'edge') {
    const pairs: string[] = [];
    for (let i = 0; i + 1 < numbers.length; i += 2) pairs.push(`${numbers[i]}–${numbers[i + 1]}`);
    return `edges between vertices ${pairs.join(', ')}${numbering}`;
  }
  const [one, many] = WHERE[problem.where];
  return `${numbers.length === 1 ? one : many} ${numbers.join(', ')}${numbering}`;
}

export function ProblemReport({ fileName, problems, file, message }: { fileName: string; problems: readonly SurfaceProblem[]; file: File | null; message: string }) {
  const errors = problems.filter((p) => p.severity === 'error');
  const warnings = problems.filter((p) => p.severity === 'warning');
  return (
    <section role="alert" aria-labelledby="rejected-heading" className="flex flex-col gap-4 rounded-3xl border-2 border-hawthorn/40 bg-hawthorn-pale/60 p-5" data-testid="surface-rejected">
      <div>
        <h3 id="rejected-heading" className="text-lg font-extrabold text-hawthorn">
          {fileName} cannot be a growth surface yet
        </h3>
        <p className="text-sm text-loam">{message} The file was not kept; fix it in your modelling program and upload it again.</p>
      </div>
      <ul className="flex flex-col gap-2" aria-label="Problems found">
        {[...errors, ...warnings].map((problem, i) => (
          <li key={`${problem.code}-${i}`} className="rounded-2xl bg-chalk px-4 py-3" data-testid="surface-problem" data-code={problem.code}>
            <div className="flex flex-wrap items-baseline gap-2">
              <span className={`rounded-full px-2 py-0.5 text-[11px] font-bold uppercase tracking-wide ${problem.severity === 'error' ? 'bg-hawthorn text-chalk' : 'bg-pollen text-tarn-deep'}`}>
                {problem.severity === 'error' ? 'Must be fixed' : 'Worth knowing'}
              </span>
              {problem.where !== 'file' && problem.count > 0 && <span className="text-xs font-semibold text-loam-soft">{plural(problem.count, ...WHERE[problem.where])}</span>}
            </div>
            <p className="pt-1 text-sm text-loam">{problem.message}</p>
            {examplesOf(problem) && <p className="pt-0.5 text-xs text-loam-soft">First ones: {examplesOf(problem)}.</p>}
          </li>
        ))}
      </ul>
      {file && problems.some((p) => p.where !== 'file' && p.examples.length > 0) && <ProblemView file={file} problems={problems} />}
    </section>
  );
}
