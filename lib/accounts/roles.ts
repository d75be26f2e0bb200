// Roles and the areas of the app each one may enter. Plain data, shared by the server's checks
// and the navigation, so that what is shown and what is allowed cannot drift apart.

export const ROLES = ['groomer', 'buyer', 'admin'] as const;
export type Role = (typeof ROLES)[number];

/** Roles a person can pick when signing up; admins are appointed. */
export const SIGN_UP_ROLES = ['groomer', 'buyer'] as const satisfies readonly Role[];

export const ROLE_LABELS: Record<Role, string> = {
  groomer: 'Groomer',
  buyer: 'Buyer',
  admin: 'Admin',
};

export type AreaId = 'studio' | 'market' | 'library' | 'sales' | 'admin';

export type Area = {
  id: AreaId;
  href: `/${string}`;
  label: string;
  /** Who may enter; `anyone` includes visitors who are not signed in. */
  allowed: 'anyone' | readonly Role[];
  summary: string;
};

/**
 * Who works in the studio: groomers, and buyers fitting what they bought to their own characters
 * (their own surfaces and grooms; selling stays a groomer's right, see the sales area).
 */
export const STUDIO_ROLES = ['groomer', 'buyer'] as const satisfies readonly Role[];

// A groomer can also buy: library (purchases) is open to groomers as well as buyers.
export const AREAS: readonly Area[] = [
  {
    id: 'studio',
    href: '/studio',
    label: 'Studio',
    allowed: STUDIO_ROLES,
    summary: 'Growth surfaces, grooms and their versions: place whorls, partings and crests, trace guides, export.',
  },
  {
    id: 'market',
    href: '/market',
    label: 'Market',
    allowed: 'anyone',
    summary: 'Presets offered by groomers, found by animal, coat length and style.',
  },
  {
    id: 'library',
    href: '/library',
    label: 'Library',
    allowed: ['buyer', 'groomer'],
    summary: 'The presets you bought, ready to download or to fit to a growth surface of your own.',
  },
  {
    id: 'sales',
    href: '/sales',
    label: 'Sales',
    allowed: ['groomer'],
    summary: 'Your presets on the market: sales, revenue, downloads and refunds.',
  },
  {
    id: 'admin',
    href: '/admin',
    label: 'Admin',
    allowed: ['admin'],
    summary: 'Listings waiting for approval, refunds, reports of abuse, roles, and the outgoing mail.',
  },
];

export function area(id: AreaId): Area {
  const found = AREAS.find((candidate) => candidate.id === id);
  if (!found) throw new Error(`unknown area ${id}`);
  return found;
}

export function mayEnter(target: Area, roles: readonly Role[] | null): boolean {
  if (target.allowed === 'anyone') return true;
  if (!roles) return false;
  return target.allowed.some((role) => roles.includes(role));
}

/** The areas to show in the navigation of someone with these roles (null: not signed in). */
export function visibleAreas(roles: readonly Role[] | null): Area[] {
  return AREAS.filter((candidate) => mayEnter(candidate, roles));
}

export function isRole(value: string): value is Role {
  return (ROLES as readonly string[]).includes(value);
}

/**
 * Where someone lands after signing in when no page asked them to come back: the place they work
 * in — the studio for a groomer, the admin pages for an admin who does not groom, the market for a
 * buyer.
 */
export function homeAfterSignIn(roles: readonly Role[]): `/${string}` {
  if (roles.includes('groomer')) return '/studio';
  if (roles.includes('admin')) return '/admin';
  return '/market';
}
