// The transfer report of lib/groom's transfer, as the studio and the market show it.
import type { TransferReport } from '@/lib/groom';

const percent = (x: number) => `${(100 * x).toFixed(x < 0.001 ? 2 : 1)} %`;
const METHOD = { topology: 'by polygon (the same polygons)', uv: 'by UV', alignment: 'by alignment along the normal' } as const;

/**
 * A transfer report in words: the method, each feature and how far it moved, what was not carried
 * over and why, the index budget on the new surface and whether the field solves there. Shown
 * before a groom moves (the studio) and before a bought or tried preset lands on a buyer's surface.
 */
export function TransferReportView({ report }: { report: TransferReport }) {
  const carried = report.features.filter((f) => f.to !== null).length;
  return (
    <div className="flex flex-col gap-2 text-sm" data-testid="transfer-report" aria-label="Transfer report">
      <p>
        Carried {METHOD[report.method]}: <strong>{carried} of {report.features.length}</strong> features.
        {report.from.uvOverlaps + report.to.uvOverlaps > 0 && ' The UV layouts overlap, so UVs were not used.'}
      </p>
      <table className="w-full text-left text-xs">
        <thead>
          <tr><th>Feature</th><th>Kind</th><th className="text-right">Moved</th></tr>
        </thead>
        <tbody>
          {report.features.map((f) => (
            <tr key={f.path}>
              <td className="font-mono">{f.path}</td>
              <td>{f.kind}</td>
              <td className="text-right">{f.moved === null ? 'not carried' : percent(f.moved)}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {report.notCarried.length > 0 && (
        <div>
          <p className="font-semibold">Not carried over</p>
          <ul className="list-disc pl-5">
            {report.notCarried.map((n) => <li key={n.path}><span className="font-mono">{n.path}</span>: {n.reason}</li>)}
          </ul>
        </div>
      )}
      <p>
        Index budget on the new surface:{' '}
        {report.budget.map((p) => `${p.demanded === null ? `${p.placed} placed (free boundary)` : `${p.placed} of ${p.demanded} placed`}${p.remainder ? `, ${p.remainder} left to place with the budget card's remainder` : ''}`).join('; ') || 'not worked out'}.
      </p>
      <p>{report.field.solved ? 'The field solves there with exactly the carried singularities.' : `The field does not solve there yet: ${report.field.message}`}</p>
    </div>
  );
}
