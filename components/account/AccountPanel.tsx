import type { ReactNode } from 'react';

export function AccountPanel({ title, intro, children }: { title: string; intro?: ReactNode; children: ReactNode }) {
  return (
    <div className="mx-auto flex w-full max-w-md flex-col gap-6 rounded-[2rem] bg-vellum p-8 shadow-sm">
      <div className="flex flex-col gap-2">
        <h1 className="text-3xl font-extrabold tracking-tight">{title}</h1>
        {intro && <div className="text-loam-soft">{intro}</div>}
      </div>
      {children}
    </div>
  );
}
