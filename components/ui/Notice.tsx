import type { ReactNode } from 'react';

const TONES = {
  error: 'border-hawthorn bg-hawthorn-pale text-hawthorn',
  success: 'border-lichen bg-lichen-pale text-tarn-deep',
  info: 'border-tarn/30 bg-vellum text-loam',
} as const;

export function Notice({ tone, children }: { tone: keyof typeof TONES; children: ReactNode }) {
  return (
    <div role={tone === 'error' ? 'alert' : 'status'} className={`rounded-2xl border-l-4 px-4 py-3 text-sm ${TONES[tone]}`}>
      {children}
    </div>
  );
}
