// The top of an area's page: its name, what it is for, and — while the area is being built —
// what it will hold, so nobody mistakes an empty page for a broken one.
import type { ReactNode } from 'react';
import { area, type AreaId } from '@/lib/accounts/roles';

export function AreaIntro({ areaId, upcoming, children }: { areaId: AreaId; upcoming: string[]; children?: ReactNode }) {
  const { label, summary } = area(areaId);
  return (
    <div className="flex flex-col gap-8">
      <div className="flex flex-col gap-3">
        <h1 className="text-4xl font-extrabold tracking-tight">{label}</h1>
        <p className="max-w-2xl text-lg text-loam-soft">{summary}</p>
      </div>
      {children}
      <section className="rounded-3xl border-2 border-dashed border-tarn/30 p-6">
        <h2 className="pb-3 text-sm font-bold uppercase tracking-[0.15em] text-bracken">Being built</h2>
        <ul className="flex list-disc flex-col gap-1.5 pl-5 text-loam-soft">
          {upcoming.map((item) => (
            <li key={item}>{item}</li>
          ))}
        </ul>
      </section>
    </div>
  );
}
