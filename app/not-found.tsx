import Link from 'next/link';

export default function NotFound() {
  return (
    <div className="mx-auto flex max-w-xl flex-col gap-4 rounded-[2rem] bg-vellum p-8">
      <p className="text-sm font-bold uppercase tracking-[0.2em] text-bracken">404</p>
      <h1 className="text-3xl font-extrabold tracking-tight">Nothing grows here</h1>
      <p className="text-loam-soft">This address does not lead to a page. It may have moved, or the link was mistyped.</p>
      <Link href="/" className="font-semibold text-tarn">
        Back to the start
      </Link>
    </div>
  );
}
