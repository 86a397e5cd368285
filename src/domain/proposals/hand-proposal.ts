// A proposal from an after-plan the installer edited by hand: what it changes against the saved
// forecast's plan, in the terms a sweep option uses (so cable runs, cautions and the generator's
// line follow the same rules), the one-off parts it needs priced from the installer's list, and a
// short name. A part the price list has no price for (a shore charger, an MPPT controller for an
// old array) is listed at 0 for the installer to price in the draft; a removal is listed at 0 as
// part of its installation, as the sweep's parts are.
import type { ResolvedArray, ResolvedPlan } from '../../engine';
import type { z } from 'zod';
import { changesSchema, proposalCreateSchema, type Changes, type Mounting, type PriceList } from './proposals.schema';
import { dcdcNow, labelOf, MOUNT_LABEL, oneOffItems, type CostItem } from './sweep';
import { handPlanOf, handPlanSchema, type HandPlan } from './sweep-edit';

/** How an array is mounted, in the price list's terms: aimed at the sun is portable, under 5° flat. */
export function mountingOf(a: Pick<ResolvedArray, 'aim' | 'tiltDeg'>): Mounting {
  if (a.aim === 'follow') return 'portable';
  return a.tiltDeg < 5 ? 'flat' : 'tilted';
}

const shoreNow = (plan: ResolvedPlan) => plan.chargers.filter((c) => c.kind === 'shore').reduce((t, c) => t + c.amps, 0);
const fmtW = (w: number) => `${Math.round(w * 10) / 10} W`;
const CONTROLLER = { mppt: 'MPPT', pwm: 'PWM' } as const;
const oneOff = (name: string, quantity: number, unit: string, unitPrice: number): CostItem => ({ name, quantity, unit, unitPrice, amount: quantity * unitPrice, kind: 'one-off' });

/** What a hand-edited after-plan changes, and what it costs. */
export interface HandProposal {
  /** The sweep-style changes (bank, added panel watts, DC-DC, generator) the cable runs and cautions follow. */
  changes: Changes;
  /** One-off parts, priced from the list where it has a price. */
  items: CostItem[];
  /** A short name: "400 Ah LiFePO4 · “Roof” +200 W · “Roof” re-aimed". */
  label: string;
  /** False when the after-plan is the rig as it is. */
  changed: boolean;
}

/** Compares the hand-edited after-plan (already applied, see handPlanApplied) with the plan as it is. */
export function handProposal(before: ResolvedPlan, edit: HandPlan, after: ResolvedPlan, prices: PriceList): HandProposal {
  const items: CostItem[] = [];
  const words: string[] = [];
  const line = (name: string, quantity: number, unit: string, unitPrice: number) => items.push(oneOff(name, quantity, unit, unitPrice));

  const asIs = handPlanOf(before);
  // A new chemistry or size is a new bank to buy; a floor alone is a setting, not a part.
  const bankBought = edit.bank.chemistry !== asIs.bank.chemistry || edit.bank.capacityAh !== asIs.bank.capacityAh;
  const bank = bankBought ? { chemistry: edit.bank.chemistry, capacityAh: edit.bank.capacityAh, floorSocPct: edit.bank.floorSocPct } : null;
  if (!bankBought && edit.bank.floorSocPct !== asIs.bank.floorSocPct) words.push(`the bank’s floor at ${edit.bank.floorSocPct} %`);

  // Arrays: matched by name as the editor keeps them; a new name is a new array.
  let addedWatts = 0;
  let addedMounting: Mounting | null = null;
  const arrayItems: CostItem[] = [];
  const arrayLine = (name: string, quantity: number, unit: string, unitPrice: number) => arrayItems.push(oneOff(name, quantity, unit, unitPrice));
  for (const a of after.arrays) {
    const old = before.arrays.find((x) => x.name === a.name);
    const m = mountingOf(a);
    if (!old) {
      addedWatts += a.ratedWatts;
      addedMounting ??= m;
      arrayLine(`Panels for “${a.name}”, ${fmtW(a.ratedWatts)}`, a.ratedWatts, 'W', prices.panelPerWatt);
      arrayLine(`Mounting, ${CONTROLLER[a.controller]} controller and wiring for “${a.name}” (${MOUNT_LABEL[m]})`, 1, '', prices.arrayInstall[m]);
      words.push(`new array “${a.name}” ${fmtW(a.ratedWatts)}`);
      continue;
    }
    const grown = a.ratedWatts - old.ratedWatts;
    if (grown > 0) {
      addedWatts += grown;
      addedMounting ??= m;
      arrayLine(`Panels added to “${a.name}”, ${fmtW(grown)} (${fmtW(old.ratedWatts)} → ${fmtW(a.ratedWatts)})`, grown, 'W', prices.panelPerWatt);
      words.push(`“${a.name}” +${fmtW(grown)}`);
    } else if (grown < 0) {
      arrayLine(`Panels taken off “${a.name}”, ${fmtW(-grown)} (in the installation)`, 1, '', 0);
      words.push(`“${a.name}” −${fmtW(-grown)}`);
    }
    // A panel aimed at the sun faces it whatever its azimuth says: only its tilt counts then.
    if (a.aim !== old.aim || a.tiltDeg !== old.tiltDeg || (a.aim === 'fixed' && a.azimuthDeg !== old.azimuthDeg)) {
      arrayLine(`Re-mounting “${a.name}”: ${a.aim === 'follow' ? 'aimed at the sun' : `tilt ${a.tiltDeg}°, facing ${a.azimuthDeg}°`} (${MOUNT_LABEL[m]})`, 1, '', prices.arrayInstall[m]);
      words.push(`“${a.name}” re-aimed`);
    }
    if (a.controller !== old.controller) {
      arrayLine(`${CONTROLLER[a.controller]} controller for “${a.name}” in place of its ${CONTROLLER[old.controller]} (price to enter)`, 1, '', 0);
      words.push(`“${a.name}” on ${CONTROLLER[a.controller]}`);
    }
  }
  for (const old of before.arrays) {
    if (!after.arrays.some((a) => a.name === old.name)) {
      arrayLine(`Removal of “${old.name}”, ${fmtW(old.ratedWatts)} (in the installation)`, 1, '', 0);
      words.push(`“${old.name}” removed`);
    }
  }

  const dcdcBefore = dcdcNow(before);
  const dcdcAmps = edit.dcdcAmps > 0 && edit.dcdcAmps !== dcdcBefore ? edit.dcdcAmps : null;
  const genBefore = before.chargers.find((c) => c.kind === 'generator') ?? null;
  const g = edit.generator;
  // Changed when a field differs from what the editor started with for the rig as it is.
  const was = asIs.generator;
  const genChanged =
    g !== null &&
    (!was || was.amps !== g.amps || was.startHour !== g.startHour || was.hoursPerDay !== g.hoursPerDay || was.marginPts !== g.marginPts || was.stopPct !== g.stopPct);

  const changes: Changes = {
    bank,
    panel: addedWatts > 0 ? { watts: Math.round(addedWatts * 10) / 10, mounting: addedMounting ?? 'flat' } : null,
    dcdcAmps,
    generatorHours: genChanged && g ? g.hoursPerDay : null,
    generatorStartHour: g?.startHour ?? 8,
    generatorAmps: g?.amps ?? 30,
    generatorMarginPts: g?.marginPts ?? 10,
    generatorStopPct: g?.stopPct ?? 90,
  };

  // The bank, DC-DC and an added generator are priced as a sweep option's are.
  items.push(...oneOffItems(before, { ...changes, panel: null }, prices));
  // A generator the rig has, sized up: its converter/charger is a part to price.
  if (genChanged && g && genBefore && g.amps !== genBefore.amps) line(`Converter/charger for the generator, ${g.amps} A (replaces the ${genBefore.amps} A; price to enter)`, 1, '', 0);
  items.push(...arrayItems);
  if (edit.dcdcAmps === 0 && dcdcBefore > 0) {
    line(`Removal of the ${dcdcBefore} A DC-DC charger (in the installation)`, 1, '', 0);
    words.push('no DC-DC charger');
  }
  const shoreBefore = shoreNow(before);
  if (edit.shoreAmps !== shoreBefore) {
    if (edit.shoreAmps > 0) line(`Converter/charger on shore power, ${edit.shoreAmps} A${shoreBefore > 0 ? ` (replaces the ${shoreBefore} A)` : ''} (price to enter)`, 1, '', 0);
    else line(`Removal of the ${shoreBefore} A shore charger (in the installation)`, 1, '', 0);
    words.push(edit.shoreAmps > 0 ? `${edit.shoreAmps} A shore charger` : 'no shore charger');
  }
  if (!g && genBefore) words.push('no generator');

  const sweepWords = labelOf({ ...changes, panel: null }, before);
  const all = [...(sweepWords === 'As it is' ? [] : [sweepWords]), ...words];
  const changed = all.length > 0;
  return { changes, items: items.filter((i) => i.quantity > 0), label: changed ? all.join(' · ') : 'As it is', changed };
}

/** Creating a draft proposal: from a sweep option (`changes`) or from a hand-edited after-plan (`handPlan`). */
export const proposalFromSchema = proposalCreateSchema
  .extend({ changes: changesSchema.optional(), handPlan: handPlanSchema.optional() })
  .superRefine((b, ctx) => {
    if (!b.changes && !b.handPlan) ctx.addIssue({ code: 'custom', path: ['changes'], message: 'Choose an option from the sweep, or run a plan edited by hand, to propose.' });
    if (b.changes && b.handPlan) ctx.addIssue({ code: 'custom', path: ['handPlan'], message: 'Propose one thing: a sweep option or a plan edited by hand, not both.' });
  });
export type ProposalFromInput = z.input<typeof proposalFromSchema>;
