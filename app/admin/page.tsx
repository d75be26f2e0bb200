import type { Metadata } from 'next';
import Link from 'next/link';
import { AreaIntro } from '@/components/areas/AreaIntro';
import { requireArea } from '@/lib/auth';

export const metadata: Metadata = { title: 'Admin' };

export default async function AdminPage() {
  await requireArea('admin');
  return (
    <AreaIntro
      areaId="admin"
      upcoming={['Approve listings before they reach the market.', 'Refunds and reports of abuse.', 'Grant and withdraw roles.']}
    >
      <Link
        href="/admin/mail"
        className="flex max-w-md flex-col gap-1 rounded-3xl bg-vellum p-6 no-underline hover:bg-lichen-pale"
      >
        <span className="text-lg font-bold text-loam">Outgoing mail</span>
        <span className="text-loam-soft">Every e-mail Whorlwind sent, as the local mail sink received it.</span>
      </Link>
    </AreaIntro>
  );
}
