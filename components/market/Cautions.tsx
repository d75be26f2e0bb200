// What a buyer should know before paying, shown beside every price on a listing and at checkout.
export function Cautions() {
  return (
    <aside aria-label="Before you buy" className="rounded-3xl border-2 border-vellum p-5 text-sm text-loam-soft">
      <h2 className="pb-2 text-xs font-bold uppercase tracking-[0.15em] text-bracken">Before you buy</h2>
      <ul className="flex list-disc flex-col gap-1 pl-5">
        <li>Prices are shown with their currency; your card is charged in that currency.</li>
        <li>Taxes and invoicing follow the seller’s and your own local rules.</li>
        <li>The licence below is the one you accept by buying. This is not legal advice.</li>
      </ul>
    </aside>
  );
}
