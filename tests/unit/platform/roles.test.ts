import { describe, expect, it } from 'vitest';
import { area, mayEnter, visibleAreas } from '@/lib/accounts/roles';

const ids = (roles: Parameters<typeof visibleAreas>[0]) => visibleAreas(roles).map((entry) => entry.id);

describe('areas by role', () => {
  it('shows visitors only the market', () => {
    expect(ids(null)).toEqual(['market']);
  });

  it('gives groomers the studio and sales, and lets them buy', () => {
    expect(ids(['groomer'])).toEqual(['studio', 'market', 'library', 'sales']);
  });

  it('lets buyers into the studio (to fit what they bought to their own surfaces) and keeps selling for groomers', () => {
    expect(ids(['buyer'])).toEqual(['studio', 'market', 'library']);
    expect(mayEnter(area('studio'), ['buyer'])).toBe(true);
    expect(mayEnter(area('sales'), ['buyer'])).toBe(false);
  });

  it('opens admin to admins only', () => {
    expect(mayEnter(area('admin'), ['admin'])).toBe(true);
    expect(mayEnter(area('admin'), ['groomer', 'buyer'])).toBe(false);
    expect(mayEnter(area('admin'), null)).toBe(false);
  });

  it('adds up the areas of several roles', () => {
    expect(ids(['admin', 'groomer'])).toEqual(['studio', 'market', 'library', 'sales', 'admin']);
  });
});
