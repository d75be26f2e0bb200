// Shown with status 403 when a signed-in person opens a page their roles do not allow.
import Link from 'next/link';
import { currentSession } from '@/lib/accounts/session';
import { ROLE_LABELS, visibleAreas } from '@/lib/accounts/roles';

export default async function Forbidden() {
  const session = await currentSession();
  const roles = session?.user.roles ?? [];
  const areas = visibleAreas(session ? roles : null);
  return (
    <div className="mx-auto flex max-w-xl flex-col gap-5 rounded-[2rem] bg-hawthorn-pale p-8">
      <p className="text-sm font-bold uppercase tracking-[0.2em] text-hawthorn">403 · not for your role</p>
      <h1 className="text-3xl font-extrabold tracking-tight">This page is not open to your account</h1>
      <p className="text-loam-soft">
        {roles.length > 0
          ? `You are signed in as ${roles.map((role) => ROLE_LABELS[role].toLowerCase()).join(' and ')}, and this page needs another role.`
          : 'This page needs a role your account does not have.'}{' '}
        If you think you should have it, ask an admin.
      </p>
      <div className="flex flex-wrap gap-2">
        {areas.map((area) => (
          <Link key={area.id} href={area.href} className="rounded-full bg-chalk px-4 py-1.5 text-sm font-semibold text-tarn no-underline hover:bg-vellum">
            {area.label}
          </Link>
        ))}
      </div>
    </div>
  );
}
