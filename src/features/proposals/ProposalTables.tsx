// The read-only parts of a proposal, shared by the screen and the printout: parts and cost, cable
// and fuse checks, cautions.
import { AMPACITY_TABLE_NAMES, cmilToMm2, gauge, type CableResult } from '../../domain/proposals/cable';
import type { ProposalDto } from '../../domain/proposals/proposals.schema';
import { formatLength, type Units } from '../../lib/units';
import { formatMoney, formatNumber } from '../../lib/format';

const qty = (p: { quantity: number; unit: string }) => `${formatNumber(p.quantity, 2)}${p.unit ? ` ${p.unit}` : ''}`;

/** Parts with quantities, unit prices and amounts, their total, and running costs apart. */
export function PartsTable({ p }: { p: Pick<ProposalDto, 'parts' | 'running' | 'currency' | 'total'> }) {
  const money = (x: number) => formatMoney(x, p.currency);
  return (
    <div className="overflow-x-auto">
      <table className="w-full border-collapse text-sm tabular-nums sm:text-base" data-testid="parts-table">
        <caption className="sr-only">Parts and their cost, {p.currency}</caption>
        <thead>
          <tr className="text-left">
            <th scope="col" className="py-1.5 pr-2">Part</th>
            <th scope="col" className="hidden py-1.5 pr-2 text-right sm:table-cell print:table-cell">Qty</th>
            <th scope="col" className="hidden py-1.5 pr-2 text-right sm:table-cell print:table-cell">Unit price</th>
            <th scope="col" className="py-1.5 text-right">Amount</th>
          </tr>
        </thead>
        <tbody>
          {p.parts.length === 0 ? (
            <tr className="border-t border-sand-dark"><td colSpan={4} className="py-2 text-slate-text">No parts listed.</td></tr>
          ) : null}
          {p.parts.map((part, i) => (
            <tr key={i} className="border-t border-sand-dark align-top">
              <td className="py-1.5 pr-2">
                {part.name}
                {/* On a phone the quantity and unit price go under the name. */}
                <span className="block text-sm text-slate-text sm:hidden print:hidden">{qty(part)} × {money(part.unitPrice)}</span>
              </td>
              <td className="hidden whitespace-nowrap py-1.5 pr-2 text-right sm:table-cell print:table-cell">{qty(part)}</td>
              <td className="hidden whitespace-nowrap py-1.5 pr-2 text-right sm:table-cell print:table-cell">{money(part.unitPrice)}</td>
              <td className="whitespace-nowrap py-1.5 text-right">{money(part.amount)}</td>
            </tr>
          ))}
        </tbody>
        <tfoot>
          <tr className="border-t-2 border-dusk font-extrabold">
            <th scope="row" className="py-2 pr-2 text-left">Total</th>
            <td className="hidden sm:table-cell print:table-cell" colSpan={2} />
            <td className="whitespace-nowrap py-2 text-right" data-testid="parts-total">{money(p.total)}</td>
          </tr>
        </tfoot>
      </table>
      {p.running.length ? (
        <p className="mt-2 text-sm text-slate-text">
          Not in the total — running costs on this trip (an estimate from the forecast):{' '}
          {p.running.map((r) => `${r.name}: ${formatNumber(r.quantity)} ${r.unit} × ${money(r.unitPrice)} = ${money(r.amount)}`).join('; ')}.
        </p>
      ) : null}
    </div>
  );
}

function gaugeText(awg: string): string {
  return `${awg} AWG (${formatNumber(cmilToMm2(gauge(awg).cmil), 1)} mm²)`;
}

function CableCard({ r, units }: { r: CableResult; units: Units }) {
  const s = r.suggested;
  const c = r.chosen;
  return (
    <li className="rounded-xl border border-sand-dark bg-white p-3 print:break-inside-avoid" data-cable={r.label}>
      <p className="font-bold">{r.label}</p>
      <dl className="mt-1 grid grid-cols-2 gap-x-4 gap-y-1 text-sm sm:grid-cols-4">
        <div><dt className="text-slate-text">Current</dt><dd className="font-semibold tabular-nums">{formatNumber(r.currentA, 1)} A</dd></div>
        <div><dt className="text-slate-text">One way</dt><dd className="font-semibold tabular-nums">{formatLength(r.oneWayM, units)}</dd></div>
        <div><dt className="text-slate-text">Drop limit</dt><dd className="font-semibold">{r.limitPct} % of {r.systemVolts} V ({r.circuit})</dd></div>
        <div><dt className="text-slate-text">Fuse or breaker</dt><dd className="font-semibold tabular-nums" data-testid="fuse">{r.fuseA !== null ? `${r.fuseA} A` : 'over 600 A'}</dd></div>
        <div className="col-span-2">
          <dt className="text-slate-text">Smallest cable that passes</dt>
          <dd className="font-semibold" data-testid="suggested-gauge">{s ? `${gaugeText(s.awg)} — drop ${formatNumber(s.dropPct, 2)} %, carries ${s.ampacityA} A` : 'none up to 4/0 AWG'}</dd>
        </div>
        {c ? (
          <div className="col-span-2">
            <dt className="text-slate-text">Installer’s choice</dt>
            <dd className={`font-semibold ${c.ok ? 'text-moss-deep' : 'text-alert'}`}>
              {gaugeText(c.awg)} — drop {formatNumber(c.dropPct, 2)} %{c.ok ? ', passes' : ', does not pass'}
            </dd>
          </div>
        ) : null}
      </dl>
      {r.notes.length ? <ul className="mt-2 list-inside list-disc text-sm text-alert">{r.notes.map((n) => <li key={n}>{n}</li>)}</ul> : null}
      <p className="mt-1 text-xs text-slate-text">Estimate. Ampacity: {AMPACITY_TABLE_NAMES[r.table]}.</p>
    </li>
  );
}

/** Each cable run with its drop, the smallest gauge that passes, the fuse, and the installer's choice. */
export function CableList({ cables, units }: { cables: ProposalDto['cables']; units: Units }) {
  if (cables.length === 0) return <p className="text-slate-text">No cable runs listed.</p>;
  return (
    <>
      <ul className="space-y-2" data-testid="cable-table">
        {cables.map((c, i) => <CableCard key={i} r={c.result} units={units} />)}
      </ul>
      <p className="mt-2 text-xs text-slate-text">
        Voltage drop over the round trip with stranded copper at 75 °C (NEC Chapter 9, Table 8); limits 3 % for charging and main feeds, 10 % elsewhere
        (ABYC E-11); fuses at least 125 % of the continuous current, the next standard size (NEC 240.6(A)), never above what the cable may carry.
      </p>
    </>
  );
}

/** The cautions, as a list with the caution look. */
export function Cautions({ items }: { items: string[] }) {
  return (
    <div className="caution print:break-inside-avoid" data-testid="cautions">
      <p className="font-bold">Before any work</p>
      <ul className="mt-1 list-inside list-disc space-y-1">
        {items.map((c) => <li key={c}>{c}</li>)}
      </ul>
    </div>
  );
}
