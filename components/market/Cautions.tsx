// What a buyer should know before paying, shown beside every price on a listing and at checkout.
import { AGE_NOTE, CANCELLATION_NOTE } from '@/lib/market/vocabulary';

export function Cautions() {
  return (
    <aside aria-label="Before you buy" className="rounded-3xl border-2 border-vellum p-5 text-sm text-loam-soft">
      <h2 className="pb-2 text-xs font-bold uppercase tracking-[0.15em] text-bracken">Before you buy</h2>
      <ul className="flex list-disc flex-col gap-1 pl-5">
        <li>Prices are shown with their currency; your card is charged in that currency.</li>
        <li>Where the law makes the market collect sales tax or VAT, the price you pay includes it; otherwise taxes follow the rules where you live.</li>
        <li>{AGE_NOTE}</li>
        <li>{CANCELLATION_NOTE}</li>
        <li>The licence below is the one you accept by buying. This is not legal advice.</li>
      </ul>
    </aside>
  );
}
