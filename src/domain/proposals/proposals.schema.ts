// Request shapes of price lists, sweeps and proposals: declared once, shared by API routes and
// forms. Every number has bounds and a message that reads after the field's name.
import { z } from 'zod';
import { CHEMISTRIES } from '../../engine';
import { AMPACITY_TABLES, DROP_METHODS, SIZE_IDS, SIZE_SYSTEMS } from './cable';
import { documentPatchSchema, NO_WIRING_PRICES, wiringPricesSchema, type ProposalDocument, type DocumentTotals, type WiringLine } from './document.schema';
import type { Forecast, ForecastSummary, ResolvedPlan } from '../../engine';
import type { CheckedCable } from './proposals';
import type { CostItem } from './sweep';

function num(min: number, max: number) {
  return z.number({ error: 'must be a number' }).min(min, { error: `must be at least ${min}` }).max(max, { error: `must be at most ${max}` });
}
function int(min: number, max: number) {
  return num(min, max).int({ error: 'must be a whole number' });
}
/** A price list's price: the form puts the field's label before these ("Panels, per rated watt must not be negative"). */
const money = z
  .number({ error: 'must be a number, such as 120.50' })
  .min(0, { error: 'must not be negative' })
  .max(1_000_000, { error: 'must be at most 1,000,000' });
/** A parts line's price, in a sentence of its own: "A price can't be negative." */
const partPrice = z
  .number({ error: 'A price must be a number, such as 120.50.' })
  .min(0, { error: "A price can't be negative." })
  .max(1_000_000, { error: "A price can't be more than 1,000,000." });
/** A number with one plain sentence for every way it can be wrong. */
function plain(what: string, min: number, max: number, unit = '') {
  const u = unit ? ` ${unit}` : '';
  const msg = `${what} must be a number from ${min.toLocaleString('en-US')} to ${max.toLocaleString('en-US')}${u}.`;
  return z.number({ error: msg }).min(min, { error: msg }).max(max, { error: msg });
}
const text = (max: number) => z.string({ error: 'must be text' }).trim().max(max, { error: `must be at most ${max} characters` });

/** An ISO 4217 code: three capital letters. */
export const currencyField = z
  .string({ error: 'must be a currency code such as USD' })
  .trim()
  .toUpperCase()
  .regex(/^[A-Z]{3}$/, { error: 'must be a three-letter currency code such as USD, EUR or CAD' });

/** How an added array is mounted. */
export const MOUNTINGS = ['flat', 'tilted', 'portable'] as const;
export type Mounting = (typeof MOUNTINGS)[number];

/** An installer's prices, per unit, in one currency. */
export const priceListSchema = z.object({
  currency: currencyField,
  /** A new bank, per Ah, by chemistry. */
  bankPerAh: z.object({ lifepo4: money, agm: money, flooded: money, gel: money }),
  /** Labour and parts to swap a bank (terminals, lugs, the main fuse). */
  bankInstall: money,
  /** Panels, per rated watt. */
  panelPerWatt: money,
  /** One added array by mounting: frame or stand, its MPPT controller and wiring. */
  arrayInstall: z.object({ flat: money, tilted: money, portable: money }),
  /** A DC-DC charger, per amp, and its installation. */
  dcdcPerAmp: money,
  dcdcInstall: money,
  /** A generator and its charger, when the rig has none. */
  generator: money,
  /** Running a generator (fuel and wear), per hour. */
  generatorPerHour: money,
  /** Cable, fuses and bus bars a proposal's cable check adds (0 until set). */
  wiring: wiringPricesSchema.default(NO_WIRING_PRICES),
});
export type PriceList = z.output<typeof priceListSchema>;
export type PriceListInput = z.input<typeof priceListSchema>;

/** Saving a price list: the version read (0 when none was saved yet). */
export const priceListPutSchema = priceListSchema.extend({
  version: z.number({ error: 'Send the version you read (0 for a first save).' }).int({ error: 'must be a whole number' }).min(0, { error: 'must be at least 0' }),
});

/** A bank to try instead of the rig's: its chemistry's defaults apply, its floor too unless the installer sets one. */
export const bankCandidateSchema = z.object({
  chemistry: z.enum(CHEMISTRIES, { error: 'must be one of lifepo4, agm, flooded, gel' }),
  capacityAh: num(1, 20_000),
  /** The lowest charge this bank may be run to, %: the chemistry's default floor when not given. */
  floorSocPct: num(0, 95).optional(),
});
export type BankCandidate = z.output<typeof bankCandidateSchema>;

/** Panels to add as a new array. */
export const panelCandidateSchema = z.object({
  watts: num(1, 10_000),
  mounting: z.enum(MOUNTINGS, { error: 'must be flat, tilted or portable' }),
  /** Tilted: default 30°; portable: default 35°. */
  tiltDeg: num(0, 90).optional(),
  /** Tilted: default facing the equator. */
  azimuthDeg: num(0, 360).optional(),
});
export type PanelCandidate = z.output<typeof panelCandidateSchema>;

/** At most this many combinations per sweep (the product asks for 200 in under a second). */
export const MAX_COMBINATIONS = 1000;

/** What the sweep tries: each list adds options to one dimension; "no change" is always tried too. */
export const candidatesSchema = z
  .object({
    banks: z.array(bankCandidateSchema).max(12, { error: 'Try at most 12 banks in one sweep.' }).default([]),
    panels: z.array(panelCandidateSchema).max(10, { error: 'Try at most 10 panel options in one sweep.' }).default([]),
    dcdcAmps: z
      .array(plain('Each DC-DC charger size', 1, 200, 'A (numbers such as 30, 50)'), { error: 'List DC-DC charger sizes as numbers of amps, such as 30, 50.' })
      .max(6, { error: 'Try at most 6 DC-DC charger sizes in one sweep.' })
      .default([]),
    generatorHours: z
      .array(plain('Each generator run', 1, 24, 'hours a day').int({ error: 'Generator runs are whole hours a day, such as 2, 4.' }))
      .max(6, { error: 'Try at most 6 generator options in one sweep.' })
      .default([]),
    /** Generator windows start at this local hour. */
    generatorStartHour: int(0, 23).default(8),
    /** Converter/charger amps of a generator added to a rig without one (common practice: 30 A). */
    generatorAmps: num(1, 300).default(30),
    /** The generator starts this many points above the line (the trip's reserve, else the bank's floor). */
    generatorMarginPts: num(0, 90).default(10),
    /** The generator stops at this charge, %. */
    generatorStopPct: num(10, 100).default(90),
    /** The rig's stated payload (what it may still carry), kg, for the weight check. */
    payloadKg: num(1, 20_000).nullable().default(null),
    /** The rig's stated room for batteries, litres, for the space check. */
    batterySpaceL: num(1, 5_000).nullable().default(null),
  })
  .superRefine((c, ctx) => {
    const n = countCombinations(c);
    if (n === 0) ctx.addIssue({ code: 'custom', path: [], message: 'Add at least one bank, panel, DC-DC charger or generator option to try.' });
    if (n > MAX_COMBINATIONS) ctx.addIssue({ code: 'custom', path: [], message: `These options make ${n} combinations; one sweep tries at most ${MAX_COMBINATIONS}. Remove some options.` });
    c.generatorHours.forEach((h, i) => {
      if (c.generatorStartHour + h > 24) ctx.addIssue({ code: 'custom', path: ['generatorHours', i], message: `runs past midnight from ${c.generatorStartHour}:00; start earlier or run fewer hours` });
    });
  });
export type Candidates = z.output<typeof candidatesSchema>;
export type CandidatesInput = z.input<typeof candidatesSchema>;

/** Options besides "as it is": (1 + banks)(1 + panels)(1 + chargers)(1 + generator) − 1. */
export function countCombinations(c: Pick<Candidates, 'banks' | 'panels' | 'dcdcAmps' | 'generatorHours'>): number {
  return (1 + c.banks.length) * (1 + c.panels.length) * (1 + c.dcdcAmps.length) * (1 + c.generatorHours.length) - 1;
}

/** A sweep request: the candidates, and prices unless the installer's saved list should be used. */
export const sweepRequestSchema = z.object({
  candidates: candidatesSchema,
  prices: priceListSchema.optional(),
});
export type SweepRequest = z.input<typeof sweepRequestSchema>;
export type SweepRequestValues = z.output<typeof sweepRequestSchema>;

/** One option: what changes against the saved forecast's plan. */
export const changesSchema = z
  .object({
    bank: bankCandidateSchema.nullable().default(null),
    panel: panelCandidateSchema.nullable().default(null),
    dcdcAmps: num(1, 200).nullable().default(null),
    generatorHours: int(1, 24).nullable().default(null),
    generatorStartHour: int(0, 23).default(8),
    generatorAmps: num(1, 300).default(30),
    generatorMarginPts: num(0, 90).default(10),
    generatorStopPct: num(10, 100).default(90),
  })
  .superRefine((c, ctx) => {
    if (!c.bank && !c.panel && c.dcdcAmps === null && c.generatorHours === null) ctx.addIssue({ code: 'custom', path: [], message: 'name at least one change: a bank, panels, a DC-DC charger or generator hours' });
    if (c.generatorHours !== null && c.generatorStartHour + c.generatorHours > 24) ctx.addIssue({ code: 'custom', path: ['generatorHours'], message: 'runs past midnight; start earlier or run fewer hours' });
  });
export type Changes = z.output<typeof changesSchema>;
export type ChangesInput = z.input<typeof changesSchema>;
/** A proposal's changes as kept: a hand-edited after-plan also keeps its name (and the plan as typed). */
export type StoredChanges = Changes & { hand?: { label: string; edit: unknown } };

/** A line of the parts list. */
export const partSchema = z.object({
  name: z.string({ error: 'Name the part.' }).trim().min(1, { error: 'Name the part.' }).max(120, { error: "A part's name can be at most 120 characters." }),
  quantity: z
    .number({ error: 'A quantity must be a number, such as 2.' })
    .gt(0, { error: 'A quantity must be more than 0.' })
    .max(100_000, { error: "A quantity can't be more than 100,000." }),
  unit: z.string({ error: 'A unit must be text, such as m or pcs.' }).trim().max(20, { error: 'A unit can be at most 20 characters, such as m or pcs.' }).default(''),
  unitPrice: partPrice,
});
export type Part = z.output<typeof partSchema>;

const sizeField = z.enum(SIZE_IDS as [string, ...string[]], { error: 'Choose a cable size from the list (AWG or mm²).' });

/** A cable run to check. */
export const cableRowSchema = z.object({
  label: z.string({ error: 'Name the run.' }).trim().min(1, { error: 'Name the run, such as “Bank to inverter”.' }).max(120, { error: "A run's name can be at most 120 characters." }),
  source: z.discriminatedUnion(
    'kind',
    [
      z.object({ kind: z.literal('charger'), amps: plain("The charger's current", 0.1, 1000, 'A') }),
      z.object({
        kind: z.literal('inverter'),
        watts: plain("The inverter's continuous watts", 1, 20_000, 'W'),
        efficiencyPct: plain("The inverter's efficiency", 50, 100, '%'),
        lowestVolts: plain('The lowest bank voltage', 5, 60, 'V'),
      }),
      z.object({ kind: z.literal('current'), amps: plain('The current', 0.1, 1000, 'A') }),
    ],
    { error: 'Say where the current comes from: a charger, an inverter or a known current.' },
  ),
  oneWayM: plain("A run's one-way length", 0.05, 100, 'm'),
  circuit: z.enum(['critical', 'non-critical'], { error: 'Choose critical or not critical for the run.' }),
  table: z.enum(AMPACITY_TABLES, { error: 'Choose an ampacity table from the list.' }).default('abyc-105c'),
  chosenAwg: sizeField.nullable().default(null),
  /** Resistance method and its temperature. */
  method: z.enum(DROP_METHODS, { error: 'Choose how the drop is worked out: ABYC-style at 20 °C or NEC Table 8 at 75 °C.' }).default('abyc-20c'),
  /** Which sizes to suggest from. */
  sizes: z.enum(SIZE_SYSTEMS, { error: 'Choose AWG or metric (mm²) sizes.' }).default('awg'),
  /** Why the run carries its current (filled for the runs we suggest). */
  basis: z.string().trim().max(300, { error: 'The note on the current can be at most 300 characters.' }).optional(),
});
export type CableRow = z.output<typeof cableRowSchema>;
export type CableRowInput = z.input<typeof cableRowSchema>;

/** Creating a draft proposal from a saved forecast and one option. */
export const proposalCreateSchema = z.object({
  forecastId: z.string({ error: 'name the saved forecast' }).min(1, { error: 'name the saved forecast' }).max(100),
  changes: changesSchema,
  prices: priceListSchema.optional(),
  title: text(120).optional(),
});
export type ProposalCreateInput = z.input<typeof proposalCreateSchema>;

const versionField = z.number({ error: 'Send the version you read.' }).int({ error: 'must be a whole number' }).min(1, { error: 'must be at least 1' });

/** Editing a draft: any of its own fields, with the version read. */
export const proposalPatchSchema = z.object({
  version: versionField,
  title: z.string({ error: 'Give the proposal a title.' }).trim().min(1, { error: 'Give the proposal a title.' }).max(120, { error: 'A title can be at most 120 characters.' }).optional(),
  notes: z.string({ error: 'Notes must be text.' }).trim().max(5000, { error: 'Notes can be at most 5,000 characters.' }).optional(),
  currency: currencyField.optional(),
  parts: z.array(partSchema).max(60, { error: 'A proposal can list at most 60 parts.' }).optional(),
  cables: z.array(cableRowSchema).max(20, { error: 'A proposal can check at most 20 cable runs.' }).optional(),
  document: documentPatchSchema.optional(),
});
export type ProposalPatchInput = z.input<typeof proposalPatchSchema>;

/** Sending a draft. */
export const proposalSendSchema = z.object({ version: versionField });

/** The crew owner's answer. */
export const decisionSchema = z.object({
  version: versionField,
  decision: z.enum(['accepted', 'declined'], { error: 'Choose accept or decline.' }),
  comment: z.string({ error: 'A comment must be text.' }).trim().max(2000, { error: 'A comment can be at most 2,000 characters.' }).default(''),
  /** The name the owner types to accept (recorded with the time). */
  name: z.string({ error: 'Type your name to accept.' }).trim().max(120, { error: 'A name can be at most 120 characters.' }).default(''),
}).superRefine((d, ctx) => {
  if (d.decision === 'accepted' && !d.name) ctx.addIssue({ code: 'custom', path: ['name'], message: 'Type your name to accept: it is recorded with the time, as a signature.' });
});
export type DecisionInput = z.input<typeof decisionSchema>;

export const PROPOSAL_STATUSES = ['draft', 'sent', 'accepted', 'declined'] as const;
export type ProposalStatus = (typeof PROPOSAL_STATUSES)[number];

// What the proposal API returns: types only, shared by the server and the islands.
/** A proposal in a list: enough to see where it stands. */
export interface ProposalListItem {
  id: string;
  title: string;
  status: ProposalStatus;
  version: number;
  rigId: string;
  rigName: string;
  crewName: string;
  tripId: string | null;
  tripName: string | null;
  installerName: string;
  currency: string;
  total: number;
  label: string;
  before: Pick<ForecastSummary, 'minSocPct' | 'firstCutoffAt' | 'unmetWh'>;
  after: Pick<ForecastSummary, 'minSocPct' | 'firstCutoffAt' | 'unmetWh'>;
  createdAt: string;
  updatedAt: string;
  sentAt: string | null;
  decidedAt: string | null;
}

/** One side of a proposal: the plan and its forecast. */
export interface ProposalSide {
  plan: ResolvedPlan;
  forecast: Forecast;
}

/** A whole proposal, with what the caller may do with it. */
export interface ProposalDto extends ProposalListItem {
  forecastId: string | null;
  notes: string;
  changes: StoredChanges;
  parts: (Part & { amount: number })[];
  /** The business document: company, contact, quote number, dates, labour, removals, tax, terms. */
  document: ProposalDocument;
  /** Cables, fuses and bus bars from the cable check, at the price list's prices. */
  wiring: WiringLine[];
  totals: DocumentTotals;
  running: CostItem[];
  cables: CheckedCable[];
  cautions: string[];
  reserveSocPct: number | null;
  before: ProposalSide & ProposalListItem['before'];
  after: ProposalSide & ProposalListItem['after'];
  decision: { comment: string; by: string | null; at: string; name: string | null } | null;
  /** The caller is its installer and it is still a draft. */
  canEdit: boolean;
  /** The caller is an owner of the rig's crew and it waits for an answer. */
  canDecide: boolean;
  /** The caller wrote it (an installer) rather than received it (the crew). */
  mine: boolean;
}
