// A proposal as a business document: who quotes (company, contact, licence), the quote's number,
// date and validity, labour, removal or trade-in of old parts, tax and terms; and the wiring prices
// the cable check's parts are priced at. Every field defaults, so a proposal saved before these
// existed reads as an empty document. Messages are plain sentences, never field paths.
import { z } from 'zod';

const money = (what = 'A price') =>
  z
    .number({ error: `${what} must be a number, such as 120.50.` })
    .min(0, { error: `${what} can't be negative.` })
    .max(1_000_000, { error: `${what} can't be more than 1,000,000.` });

const line = (what: string, max: number) => z.string({ error: `${what} must be text.` }).trim().max(max, { error: `${what} can be at most ${max.toLocaleString('en-US')} characters.` });

/** Prices of the parts a cable check adds, in the price list's currency. */
export const wiringPricesSchema = z.object({
  /** Cable, per metre of conductor and per mm² of its area (copper cost grows with the area). */
  cablePerMm2M: money('A cable price'),
  /** A fuse or breaker with its holder, each. */
  fuse: money('A fuse price'),
  /** A pair of bus bars (positive and negative), when the upgrade adds runs. */
  busBars: money('A bus bar price'),
});
export type WiringPrices = z.output<typeof wiringPricesSchema>;

/** No wiring prices yet: every figure 0, nothing invented. */
export const NO_WIRING_PRICES: WiringPrices = { cablePerMm2M: 0, fuse: 0, busBars: 0 };

/** A labour line: what is done, hours and the hourly rate. */
export const labourLineSchema = z.object({
  name: z.string({ error: 'Say what the labour is for.' }).trim().min(1, { error: 'Say what the labour is for, such as “Fit the new bank”.' }).max(120, { error: 'A labour line can be at most 120 characters.' }),
  hours: z.number({ error: 'Hours must be a number, such as 2.5.' }).gt(0, { error: 'Hours must be more than 0.' }).max(1000, { error: "Hours can't be more than 1,000." }),
  rate: money('An hourly rate'),
});
export type LabourLine = z.output<typeof labourLineSchema>;

/** Taking out an old part: a charge (removal, disposal) or a credit (trade-in). */
export const removalLineSchema = z.object({
  name: z.string({ error: 'Name the old part.' }).trim().min(1, { error: 'Name the old part, such as “Old 200 Ah AGM bank”.' }).max(120, { error: 'An old part’s name can be at most 120 characters.' }),
  kind: z.enum(['removal', 'trade-in'], { error: 'Choose removal (a charge) or trade-in (a credit).' }),
  amount: money('An amount'),
});
export type RemovalLine = z.output<typeof removalLineSchema>;

/** A calendar day, YYYY-MM-DD. */
const day = z.string({ error: 'A date must look like 2027-03-14.' }).regex(/^\d{4}-\d{2}-\d{2}$/, { error: 'A date must look like 2027-03-14.' });

/** The document's own fields. */
export const documentSchema = z.object({
  company: line('The company name', 120).default(''),
  contactName: line('The contact name', 120).default(''),
  phone: line('The phone number', 40).default(''),
  email: line('The e-mail address', 200).default(''),
  address: line('The address', 300).default(''),
  /** Licence or registration number, optional. */
  licence: line('The licence or registration number', 80).default(''),
  quoteNumber: line('The quote number', 40).default(''),
  issuedOn: day.nullable().default(null),
  validDays: z.number({ error: 'Days valid must be a whole number from 1 to 365.' }).int({ error: 'Days valid must be a whole number from 1 to 365.' }).min(1, { error: 'Days valid must be a whole number from 1 to 365.' }).max(365, { error: 'Days valid must be a whole number from 1 to 365.' }).default(30),
  taxRatePct: z.number({ error: 'The tax rate must be a number, such as 8.25.' }).min(0, { error: "The tax rate can't be negative." }).max(50, { error: "The tax rate can't be more than 50 %." }).default(0),
  terms: line('The terms', 3000).default(''),
  labour: z.array(labourLineSchema).max(20, { error: 'A proposal can list at most 20 labour lines.' }).default([]),
  removals: z.array(removalLineSchema).max(20, { error: 'A proposal can list at most 20 old parts.' }).default([]),
  wiringPrices: wiringPricesSchema.default(NO_WIRING_PRICES),
});
export type ProposalDocument = z.output<typeof documentSchema>;
export type ProposalDocumentInput = z.input<typeof documentSchema>;

/** Editing the document: the whole of it, as the draft editor sends it. */
export const documentPatchSchema = documentSchema;

/** A part the cable check adds, priced from the wiring prices; `run` is the cable run's index. */
export interface WiringLine {
  kind: 'cable' | 'fuse' | 'bus-bars';
  run: number | null;
  name: string;
  quantity: number;
  unit: string;
  unitPrice: number;
  amount: number;
}

/** The document's sums, each to the cent. */
export interface DocumentTotals {
  parts: number;
  wiring: number;
  labour: number;
  /** Removal charges less trade-in credits. */
  removals: number;
  subtotal: number;
  taxRatePct: number;
  tax: number;
  total: number;
}
