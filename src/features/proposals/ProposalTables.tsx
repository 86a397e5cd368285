// The read-only parts of a proposal, shared by the screen and the printout: who quotes and the
// quote's number and dates, the parts table (parts, the cable check's runs drawn as small line
// sketches with their cable, fuse and bus bars, labour, old parts) with tax and total, and cautions.
import { AMPACITY_TABLE_NAMES, DROP_METHOD_NAMES, DROP_METHOD_SHORT, conductor, type CableResult } from '../../domain/proposals/cable';
import { validUntil } from '../../domain/proposals/document';
import type { ProposalDto } from '../../domain/proposals/proposals.schema';
import { formatLength, type Units } from '../../lib/units';
import { CAUTIONS, coldCaution } from '../../domain/advice/cautions';
import { formatDate, formatMoney, formatNumber } from '../../lib/format';

const qty = (p: { quantity: number; unit: string }) => `${formatNumber(p.quantity, 2)}${p.unit ? ` ${p.unit}` : ''}`;

/** The day a quote is dated: the document's own date, else the day it was sent, else drafted. */
export function quoteDate(p: Pick<ProposalDto, 'document' | 'sentAt' | 'createdAt'>): string {
  return p.document.issuedOn ?? (p.sentAt ?? p.createdAt).slice(0, 10);
}

/** Who quotes (the installer's block, first on page 1) and the quote's number, dates and addressee. */
export function DocumentHead({ p }: { p: ProposalDto }) {
  const d = p.document;
  const date = quoteDate(p);
  // The contact line names the contact only when it is not the account's own name, shown above.
  const contact = [d.contactName !== p.installerName ? d.contactName : '', d.phone, d.email].filter(Boolean);
  return (
    <div className="grid gap-4 sm:grid-cols-2 print:grid-cols-2" data-testid="document-head">
      <div className="rounded-xl border border-sand-dark bg-white p-3 print:border-0 print:p-0" data-testid="installer-block">
        <p className="text-xs font-bold uppercase tracking-wide text-slate-text">Prepared by</p>
        {d.company ? <p className="text-lg font-extrabold" data-testid="company">{d.company}</p> : null}
        <p className={d.company ? '' : 'text-lg font-extrabold'} data-testid="installer-name">{p.installerName}</p>
        {contact.length ? <p className="text-sm">{contact.join(' · ')}</p> : null}
        {d.address ? <p className="whitespace-pre-line text-sm">{d.address}</p> : null}
        {d.licence ? <p className="text-sm">Licence or registration no. {d.licence}</p> : null}
      </div>
      <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5 self-start text-sm" data-testid="quote-block">
        <dt className="text-slate-text">Quote no.</dt>
        <dd className="font-bold" data-testid="quote-number">{d.quoteNumber || '—'}</dd>
        <dt className="text-slate-text">Date</dt>
        <dd>{formatDate(date)}</dd>
        <dt className="text-slate-text">Valid until</dt>
        <dd data-testid="valid-until">{formatDate(validUntil(date, d.validDays))} ({d.validDays} days)</dd>
        <dt className="text-slate-text">For</dt>
        <dd>{p.crewName}, rig “{p.rigName}”{p.tripName ? `, trip “${p.tripName}”` : ''}</dd>
      </dl>
    </div>
  );
}

/** What a run feeds, in a word for the sketch's far end, read from its label. */
export function runEnd(label: string): string {
  const l = label.toLowerCase();
  if (l.includes('inverter')) return 'Inverter';
  if (l.includes('mppt') || l.includes('panel')) return 'MPPT';
  if (l.includes('dc-dc')) return 'DC-DC';
  if (l.includes('converter') || l.includes('charger')) return 'Charger';
  if (l.includes('bus')) return 'Bus bar';
  return 'Load';
}

/** A run drawn as a line: the bank's positive post, its fuse, the cable, and the part it feeds. */
export function RunSketch({ r }: { r: CableResult }) {
  const pick = r.chosen ?? r.suggested;
  const ok = pick?.ok ?? false;
  const line = ok ? '#2F3E55' : '#B3261E';
  return (
    <svg viewBox="0 0 240 36" className="h-9 w-full max-w-[15rem]" aria-hidden="true" data-testid="run-sketch">
      {/* bank */}
      <rect x="1" y="8" width="30" height="20" rx="3" fill="#F6EFE3" stroke="#2F3E55" strokeWidth="1.5" />
      <text x="16" y="22" textAnchor="middle" fontSize="11" fontWeight="700" fill="#2F3E55">+</text>
      {/* cable out, the fuse near the post, cable on to the part */}
      <line x1="31" y1="18" x2="46" y2="18" stroke={line} strokeWidth="3" />
      <rect x="46" y="12" width="18" height="12" rx="2" fill="#fff" stroke="#D9642E" strokeWidth="1.5" />
      <line x1="46" y1="18" x2="64" y2="18" stroke="#D9642E" strokeWidth="1.5" />
      <line x1="64" y1="18" x2="196" y2="18" stroke={line} strokeWidth="3" strokeDasharray={ok ? undefined : '6 3'} />
      {/* the part it feeds */}
      <rect x="196" y="8" width="42" height="20" rx="3" fill="#fff" stroke="#2F3E55" strokeWidth="1.5" />
      <text x="217" y="21" textAnchor="middle" fontSize="8" fill="#2F3E55">{runEnd(r.label)}</text>
      <text x="55" y="9" textAnchor="middle" fontSize="8" fill="#2F3E55">{r.fuseA !== null ? `${r.fuseA} A` : ''}</text>
      <text x="130" y="12" textAnchor="middle" fontSize="9" fill="#2F3E55">{pick ? (conductor(pick.awg)?.label ?? pick.awg) : 'no single cable'}</text>
      <text x="130" y="32" textAnchor="middle" fontSize="8" fill="#4A5568">{pick ? `${formatNumber(pick.dropPct, 1)} % drop` : ''}</text>
    </svg>
  );
}

function RunRows({ r, wiring, money, units }: { r: CableResult; wiring: ProposalDto['wiring']; money: (x: number) => string; units: Units }) {
  const pick = r.chosen ?? r.suggested;
  const size = pick ? (conductor(pick.awg)?.label ?? pick.awg) : null;
  return (
    <>
      <tr className="border-t border-sand-dark align-top" data-cable={r.label}>
        <td colSpan={4} className="pt-2 pr-2">
          <p className="font-bold">{r.label}</p>
          <div className="flex flex-col gap-1 sm:flex-row sm:items-center sm:gap-3 print:flex-row print:items-center print:gap-3">
            <RunSketch r={r} />
            <p className="text-sm">
              <span data-testid="run-size">{size ?? 'No single cable passes'}</span>, {formatLength(r.oneWayM, units)} one way · {formatNumber(r.currentA, 1)} A · fuse{' '}
              <span data-testid="fuse">{r.fuseA !== null ? `${r.fuseA} A` : 'over 600 A'}</span>
              {pick ? (
                <>
                  {' '}
                  · drop <span data-testid="run-drop">{formatNumber(pick.dropPct, 2)} %</span> of {r.systemVolts} V (limit {r.limitPct} %,{' '}
                  <span data-testid="run-method">{DROP_METHOD_SHORT[r.method ?? 'nec-75c']}</span>)
                </>
              ) : null}
              {r.chosen ? <span className={r.chosen.ok ? 'text-moss-deep' : 'text-alert'}> · the installer’s choice{r.chosen.ok ? ', passes' : ', does not pass'}</span> : null}
            </p>
          </div>
          {r.basis ? <p className="text-xs text-slate-text" data-testid="run-basis">{r.basis}</p> : null}
          {r.notes.length ? <ul className="list-inside list-disc text-sm text-alert">{r.notes.map((n) => <li key={n}>{n}</li>)}</ul> : null}
        </td>
      </tr>
      {wiring.map((w, i) => (
        <LineRow key={i} name={w.kind === 'cable' ? `Cable ${size ?? ''}, out and back` : `Fuse or breaker ${r.fuseA ?? ''} A with holder`} quantity={qty(w)} unitPrice={money(w.unitPrice)} amount={money(w.amount)} indent />
      ))}
    </>
  );
}

function LineRow({ name, quantity, unitPrice, amount, indent = false, testid }: { name: string; quantity: string; unitPrice: string; amount: string; indent?: boolean; testid?: string }) {
  return (
    <tr className={`align-top ${indent ? '' : 'border-t border-sand-dark'}`} data-testid={testid}>
      <td className={`py-1.5 pr-2 ${indent ? 'pl-4' : ''}`}>
        {name}
        {/* On a phone the quantity and unit price go under the name. */}
        {unitPrice ? <span className="block text-sm text-slate-text sm:hidden print:hidden">{quantity} × {unitPrice}</span> : null}
      </td>
      <td className="hidden whitespace-nowrap py-1.5 pr-2 text-right sm:table-cell print:table-cell">{quantity}</td>
      <td className="hidden whitespace-nowrap py-1.5 pr-2 text-right sm:table-cell print:table-cell">{unitPrice}</td>
      <td className="whitespace-nowrap py-1.5 text-right">{amount}</td>
    </tr>
  );
}

function GroupHead({ children }: { children: string }) {
  return (
    <tr className="border-t-2 border-sand-dark">
      <th scope="colgroup" colSpan={4} className="pt-3 pb-0.5 text-left text-xs font-bold uppercase tracking-wide text-slate-text">{children}</th>
    </tr>
  );
}

function SumRow({ label, amount, strong = false, testid }: { label: string; amount: string; strong?: boolean; testid?: string }) {
  return (
    <tr className={strong ? 'border-t-2 border-dusk font-extrabold' : ''}>
      <th scope="row" className="py-1 pr-2 text-left font-semibold sm:text-right print:text-right" colSpan={1}>{label}</th>
      <td className="hidden sm:table-cell print:table-cell" colSpan={2} />
      <td className="whitespace-nowrap py-1 text-right" data-testid={testid}>{amount}</td>
    </tr>
  );
}

/** The proposal's priced lines: parts, the cable check's runs with their cable, fuse and bus bars, labour and old parts; subtotal, tax and total. */
export function PartsTable({ p, units }: { p: Pick<ProposalDto, 'parts' | 'running' | 'currency' | 'total' | 'wiring' | 'cables' | 'document' | 'totals'>; units: Units }) {
  const money = (x: number) => formatMoney(x, p.currency);
  const d = p.document;
  const busBars = p.wiring.find((w) => w.kind === 'bus-bars');
  const methods = [...new Set(p.cables.map((c) => c.result.method ?? 'nec-75c'))];
  const tables = [...new Set(p.cables.map((c) => c.result.table))];
  return (
    <div className="overflow-x-auto">
      <table className="w-full border-collapse text-sm tabular-nums sm:text-base print:text-[10pt]" data-testid="parts-table">
        <caption className="sr-only">Parts, wiring, labour and their cost, {p.currency}</caption>
        <thead>
          <tr className="text-left">
            <th scope="col" className="py-1.5 pr-2">Item</th>
            <th scope="col" className="hidden py-1.5 pr-2 text-right sm:table-cell print:table-cell">Qty</th>
            <th scope="col" className="hidden py-1.5 pr-2 text-right sm:table-cell print:table-cell">Unit price</th>
            <th scope="col" className="py-1.5 text-right">Amount</th>
          </tr>
        </thead>
        <tbody>
          <GroupHead>Parts</GroupHead>
          {p.parts.length === 0 ? <tr className="border-t border-sand-dark"><td colSpan={4} className="py-2 text-slate-text">No parts listed.</td></tr> : null}
          {p.parts.map((part, i) => <LineRow key={i} name={part.name} quantity={qty(part)} unitPrice={money(part.unitPrice)} amount={money(part.amount)} />)}
        </tbody>
        {p.cables.length ? (
          <tbody data-testid="cable-table">
            <GroupHead>Cables, fuses and bus bars (from the cable check, estimates)</GroupHead>
            {p.cables.map((c, i) => (
              <RunRows key={i} r={c.result} wiring={p.wiring.filter((w) => w.run === i)} money={money} units={units} />
            ))}
            {busBars ? <LineRow name={busBars.name} quantity={qty(busBars)} unitPrice={money(busBars.unitPrice)} amount={money(busBars.amount)} /> : null}
          </tbody>
        ) : null}
        {d.labour.length ? (
          <tbody>
            <GroupHead>Labour</GroupHead>
            {d.labour.map((l, i) => <LineRow key={i} name={l.name} quantity={`${formatNumber(l.hours, 2)} h`} unitPrice={money(l.rate)} amount={money(Math.round(l.hours * l.rate * 100) / 100)} />)}
          </tbody>
        ) : null}
        {d.removals.length ? (
          <tbody>
            <GroupHead>Old parts: removal and trade-in</GroupHead>
            {d.removals.map((r, i) => <LineRow key={i} name={`${r.name} (${r.kind === 'trade-in' ? 'trade-in, a credit' : 'removal'})`} quantity="1" unitPrice="" amount={money(r.kind === 'trade-in' ? -r.amount : r.amount)} />)}
          </tbody>
        ) : null}
        <tfoot>
          <SumRow label="Subtotal" amount={money(p.totals.subtotal)} testid="subtotal" />
          <SumRow label={`Tax ${formatNumber(p.totals.taxRatePct, 2)} %`} amount={money(p.totals.tax)} testid="tax" />
          <SumRow label="Total" amount={money(p.totals.total)} strong testid="parts-total" />
        </tfoot>
      </table>
      {p.running.length ? (
        <p className="mt-2 text-sm text-slate-text">
          Not in the total — running costs on this trip (an estimate from the forecast):{' '}
          {p.running.map((r) => `${r.name}: ${formatNumber(r.quantity)} ${r.unit} × ${money(r.unitPrice)} = ${money(r.amount)}`).join('; ')}.
        </p>
      ) : null}
      {p.cables.length ? (
        <p className="mt-2 text-xs text-slate-text" data-testid="cable-method">
          Cable check: voltage drop over the round trip by the {methods.map((m) => DROP_METHOD_NAMES[m]).join('; ')}; limits 3 % for charging and main feeds and 10 % elsewhere (ABYC E-11); a fuse of at least 125 % of the
          current, the next standard size (NEC 240.6(A)), never above what the cable may carry ({tables.map((t) => AMPACITY_TABLE_NAMES[t]).join('; ')}). A dashed line is a run whose cable does not pass.
        </p>
      ) : null}
    </div>
  );
}

/** The cautions, as a list with the caution look; the cold-charging one states freezing in the reader's units. */
export function Cautions({ items, units = 'metric' }: { items: string[]; units?: Units }) {
  return (
    <div className="caution print:break-inside-avoid" data-testid="cautions">
      <p className="font-bold">Before any work</p>
      <ul className="mt-1 list-inside list-disc space-y-1">
        {items.map((c) => <li key={c}>{c === CAUTIONS.cold ? coldCaution(units) : c}</li>)}
      </ul>
    </div>
  );
}
