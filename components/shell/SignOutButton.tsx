'use client';
import { signOut } from 'next-auth/react';

export function SignOutButton() {
  return (
    <button
      type="button"
      onClick={() => signOut({ callbackUrl: '/' })}
      className="rounded-full border-2 border-chalk/40 px-4 py-1.5 text-sm font-semibold text-chalk hover:border-chalk"
    >
      Sign out
    </button>
  );
}
