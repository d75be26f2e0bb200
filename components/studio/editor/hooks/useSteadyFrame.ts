'use client';
// The stage's framing (centre and radius) kept as the same objects while their values stay the
// same: the stage frames the view again whenever they change, and the surface as read and the
// prepared surface that replaces it have equal ones — the groomer's view must not jump back then.
import { useMemo } from 'react';
import type { Vec3 } from '@/lib/studio/client/features';

export function useSteadyFrame(shown: { readonly center: Vec3; readonly radius: number } | null): { readonly center: Vec3; readonly radius: number } | null {
  const [x, y, z] = shown?.center ?? [NaN, NaN, NaN];
  const radius = shown?.radius ?? NaN;
  const present = shown !== null;
  return useMemo(() => (present ? { center: [x, y, z] as Vec3, radius } : null), [present, x, y, z, radius]);
}
