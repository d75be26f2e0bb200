// The band across the top of every page: the mark, the areas this person may enter, and who is
// signed in (or the way to sign in).
import Link from 'next/link';
import { currentSession } from '@/lib/accounts/session';
import { ROLE_LABELS, visibleAreas } from '@/lib/accounts/roles';
import { WhorlMark } from './WhorlMark';
import { SignOutButton } from './SignOutButton';

export async function SiteHeader() {
  const session = await currentSession();
  const areas = visibleAreas(session?.user.roles ?? null);
  return (
    <header className="bg-tarn text-chalk">
      <div className="mx-auto flex max-w-6xl flex-wrap items-center gap-x-8 gap-y-3 px-6 py-4">
        <Link href="/" className="flex items-center gap-2.5 no-underline">
          <WhorlMark />
          <span className="text-xl font-extrabold tracking-tight lowercase">whorlwind</span>
        </Link>
        <nav aria-label="Areas" className="flex flex-1 flex-wrap gap-1">
          {areas.map((area) => (
            <Link
              key={area.id}
              href={area.href}
              className="rounded-full px-3.5 py-1.5 text-sm font-medium text-chalk/85 no-underline hover:bg-tarn-deep hover:text-chalk"
            >
              {area.label}
            </Link>
          ))}
        </nav>
        {session ? (
          <div className="flex items-center gap-3" data-testid="signed-in-as">
            <div className="text-right leading-tight">
              <div className="text-sm font-semibold">{session.user.name}</div>
              <div className="flex justify-end gap-1 pt-0.5">
                {session.user.roles.map((role) => (
                  <span key={role} className="rounded-full bg-pollen px-2 py-0.5 text-[11px] font-bold uppercase tracking-wide text-tarn-deep">
                    {ROLE_LABELS[role]}
                  </span>
                ))}
              </div>
            </div>
            <SignOutButton />
          </div>
        ) : (
          <div className="flex items-center gap-2">
            <Link href="/signin" className="rounded-full px-4 py-1.5 text-sm font-semibold text-chalk no-underline hover:bg-tarn-deep">
              Sign in
            </Link>
            <Link href="/signup" className="rounded-full bg-pollen px-4 py-1.5 text-sm font-semibold text-tarn-deep no-underline hover:bg-chalk">
              Create an account
            </Link>
          </div>
        )}
      </div>
    </header>
  );
}
