import type { Metadata } from 'next';
import { CaughtMailList } from '@/components/admin/CaughtMailList';
import { requireArea } from '@/lib/accounts/session';

export const metadata: Metadata = { title: 'Outgoing mail' };

export default async function OutgoingMailPage() {
  await requireArea('admin');
  return (
    <div className="flex flex-col gap-6">
      <div className="flex flex-col gap-2">
        <h1 className="text-4xl font-extrabold tracking-tight">Outgoing mail</h1>
        <p className="max-w-2xl text-loam-soft">
          What Whorlwind sent — confirmation and reset links among it — as the local mail sink received it. The sink keeps mail
          until it stops. Newest first; the list refreshes by itself.
        </p>
      </div>
      <CaughtMailList />
    </div>
  );
}
