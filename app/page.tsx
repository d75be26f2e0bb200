import Link from 'next/link';
import { FlowFieldArt } from '@/components/landing/FlowFieldArt';
import { currentSession } from '@/lib/accounts/session';
import { visibleAreas } from '@/lib/accounts/roles';

const STEPS = [
  {
    title: 'Place the coat’s features',
    text: 'Upload the growth surface and put whorls, saddles, partings, crests and flow strokes where the animal has them. The index budget tells you what the surface still demands.',
  },
  {
    title: 'Get a field with no stray swirls',
    text: 'Whorlwind solves for the smoothest direction field whose singularities are exactly the ones you placed — and nowhere else.',
  },
  {
    title: 'Hand over guides',
    text: 'Guides are traced along the field, shaped with lift, droop and curl, previewed in 3D and exported as USD curves, glTF, OBJ or the groom spec.',
  },
];

export default async function LandingPage() {
  const session = await currentSession();
  const areas = session ? visibleAreas(session.user.roles).filter((area) => area.allowed !== 'anyone') : [];
  return (
    <div className="flex flex-col gap-16">
      <section className="grid items-center gap-10 md:grid-cols-[1.1fr_1fr]">
        <div className="flex flex-col gap-6">
          <p className="text-sm font-bold uppercase tracking-[0.2em] text-bracken">For character groomers</p>
          <h1 className="text-4xl font-extrabold leading-tight tracking-tight md:text-5xl">
            Decide which way the fur lies. Hand the pipeline its guide curves.
          </h1>
          <p className="max-w-xl text-lg text-loam-soft">
            Whorlwind turns the whorls, partings and crests you place on a creature into a smooth direction field, then
            traces the guides your renderer needs. Sell finished grooms as presets; buy the coats others have worked out.
          </p>
          <div className="flex flex-wrap gap-3">
            {session ? (
              areas.map((area) => (
                <Link key={area.id} href={area.href} className="rounded-full bg-bracken px-5 py-2.5 font-semibold text-chalk no-underline hover:bg-bracken-deep">
                  Open {area.label.toLowerCase()}
                </Link>
              ))
            ) : (
              <>
                <Link href="/signup" className="rounded-full bg-bracken px-5 py-2.5 font-semibold text-chalk no-underline hover:bg-bracken-deep">
                  Create an account
                </Link>
                <Link href="/signin" className="rounded-full border-2 border-tarn/30 px-5 py-2.5 font-semibold text-tarn no-underline hover:border-tarn">
                  Sign in
                </Link>
              </>
            )}
            <Link href="/market" className="rounded-full px-5 py-2.5 font-semibold text-tarn hover:underline">
              Browse the market
            </Link>
          </div>
        </div>
        <FlowFieldArt />
      </section>
      <section aria-labelledby="how-heading" className="flex flex-col gap-6">
        <h2 id="how-heading" className="text-2xl font-extrabold tracking-tight">
          From surface to guides
        </h2>
        <ol className="grid gap-5 md:grid-cols-3">
          {STEPS.map((step, index) => (
            <li key={step.title} className="flex flex-col gap-2 rounded-3xl bg-vellum p-6">
              <span className="flex h-9 w-9 items-center justify-center rounded-full bg-tarn text-sm font-bold text-chalk">{index + 1}</span>
              <h3 className="text-lg font-bold">{step.title}</h3>
              <p className="text-loam-soft">{step.text}</p>
            </li>
          ))}
        </ol>
      </section>
    </div>
  );
}
