'use client';
// The side panels' tabs: features, guides, field and view, and for a saved groom its versions and
// exports. The active panel is given as children.
import type { ReactNode } from 'react';

export type PanelTab = 'features' | 'guides' | 'field' | 'versions' | 'export' | 'surface';

const TABS: readonly (readonly [PanelTab, string])[] = [
  ['features', 'Features'],
  ['guides', 'Guides'],
  ['field', 'Field & view'],
];
const SAVED_TABS: readonly (readonly [PanelTab, string])[] = [
  ['versions', 'Versions'],
  ['export', 'Export'],
  ['surface', 'Surface'],
];

export function PanelTabs({ tab, onTab, saved, children }: { tab: PanelTab; onTab: (tab: PanelTab) => void; saved: boolean; children: ReactNode }) {
  return (
    <>
      <div role="tablist" aria-label="Panels" className="flex flex-wrap gap-1 rounded-2xl bg-vellum p-1">
        {[...TABS, ...(saved ? SAVED_TABS : [])].map(([id, label]) => (
          <button
            key={id}
            type="button"
            role="tab"
            id={`tab-${id}`}
            aria-selected={tab === id}
            aria-controls={`panel-${id}`}
            onClick={() => onTab(id)}
            className={`flex-1 rounded-xl px-2.5 py-1.5 text-sm font-semibold ${tab === id ? 'bg-tarn text-chalk' : 'text-tarn hover:bg-chalk'}`}
          >
            {label}
          </button>
        ))}
      </div>
      <div role="tabpanel" id={`panel-${tab}`} aria-labelledby={`tab-${tab}`} className="min-h-0 flex-1 overflow-y-auto rounded-2xl bg-vellum/60 p-3">
        {children}
      </div>
    </>
  );
}
