// The business document's rules: the parts a cable check adds, the sums with tax, the quote number,
// the validity date, and a new draft's starting document. Pure; the server and the islands share it.
import { conductor } from './cable';
import type { ProposalDocument, DocumentTotals, WiringLine, WiringPrices } from './document.schema';
import { documentSchema } from './document.schema';
import type { CheckedCable } from './proposals';
import type { Part } from './proposals.schema';

const cents = (x: number) => Math.round(x * 100) / 100;

/**
 * Cables, fuses and bus bars from the cable check, at the wiring prices: per run, the cable it
 * needs (the installer's size, else the suggestion) over the round trip, out and back, priced per
 * metre by its area; its fuse or breaker with holder; and one pair of bus bars when there are runs.
 */
export function wiringLines(cables: CheckedCable[], prices: WiringPrices): WiringLine[] {
  const out: WiringLine[] = [];
  cables.forEach(({ result: r }, run) => {
    const pick = r.chosen ?? r.suggested;
    const size = pick ? conductor(pick.awg) : undefined;
    if (size) {
      const metres = Math.round(2 * r.oneWayM * 100) / 100;
      const unitPrice = cents(prices.cablePerMm2M * size.mm2);
      out.push({ kind: 'cable', run, name: `Cable ${size.label}, ${r.label} (out and back)`, quantity: metres, unit: 'm', unitPrice, amount: cents(metres * unitPrice) });
    }
    if (r.fuseA !== null) out.push({ kind: 'fuse', run, name: `Fuse or breaker ${r.fuseA} A with holder, ${r.label}`, quantity: 1, unit: 'pcs', unitPrice: prices.fuse, amount: cents(prices.fuse) });
  });
  if (cables.length > 0) out.push({ kind: 'bus-bars', run: null, name: 'Bus bars, positive and negative', quantity: 1, unit: 'pair', unitPrice: prices.busBars, amount: cents(prices.busBars) });
  return out;
}

/** Parts, wiring, labour and removals (charges less trade-in credits), the subtotal, tax at the document's rate, and the total. */
export function documentTotals(parts: Pick<Part, 'quantity' | 'unitPrice'>[], wiring: Pick<WiringLine, 'amount'>[], doc: Pick<ProposalDocument, 'labour' | 'removals' | 'taxRatePct'>): DocumentTotals {
  const p = cents(parts.reduce((t, x) => t + cents(x.quantity * x.unitPrice), 0));
  const w = cents(wiring.reduce((t, x) => t + x.amount, 0));
  const l = cents(doc.labour.reduce((t, x) => t + cents(x.hours * x.rate), 0));
  const r = cents(doc.removals.reduce((t, x) => t + (x.kind === 'trade-in' ? -x.amount : x.amount), 0));
  const subtotal = cents(p + w + l + r);
  const tax = cents(Math.max(0, subtotal) * (doc.taxRatePct / 100));
  return { parts: p, wiring: w, labour: l, removals: r, subtotal, taxRatePct: doc.taxRatePct, tax, total: cents(subtotal + tax) };
}

/** The installer's next quote number: Q-<year>-<sequence, three digits>. */
export function quoteNumber(year: number, sequence: number): string {
  return `Q-${year}-${String(sequence).padStart(3, '0')}`;
}

/** The last day a quote holds: its issue date plus the days it is valid (calendar days, UTC). */
export function validUntil(issuedOn: string, validDays: number): string {
  const d = new Date(`${issuedOn}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + validDays);
  return d.toISOString().slice(0, 10);
}

/**
 * A new draft's document: the installer's company, contact, licence, tax rate, validity and terms
 * from their last proposal (so they type them once), a new quote number, no labour or removal lines
 * yet (the old part's removal comes with the option's parts), and the list's wiring prices.
 */
export function startingDocument(p: { previous: unknown; quote: string; wiringPrices: WiringPrices }): ProposalDocument {
  const prev = documentSchema.safeParse(p.previous ?? {});
  const base = prev.success ? prev.data : documentSchema.parse({});
  return { ...base, quoteNumber: p.quote, issuedOn: null, labour: [], removals: [], wiringPrices: p.wiringPrices };
}

/** A stored document (JSON text), read with every default. */
export function readDocument(json: string): ProposalDocument {
  let raw: unknown = {};
  try {
    raw = JSON.parse(json);
  } catch {
    raw = {};
  }
  const parsed = documentSchema.safeParse(raw);
  return parsed.success ? parsed.data : documentSchema.parse({});
}
