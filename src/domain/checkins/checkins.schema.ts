import { z } from 'zod';

// A check-in as the camper sends it: when, and either the SOC the monitor shows or a resting
// voltage. The id is made on the phone (a UUID), so a check-in queued offline and sent twice is
// stored once. Shared by the API route and the form.

/** ISO 8601 with an offset: 2027-10-22T07:30-06:00, …Z, seconds optional. */
export const ISO_WITH_OFFSET = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d{1,3})?)?(Z|[+-]\d{2}:\d{2})$/;

export const checkInInputSchema = z
  .object({
    id: z.uuid({ error: 'must be a UUID made by the app' }),
    at: z
      .string({ error: 'must be a time such as 2027-10-22T07:30-06:00' })
      .regex(ISO_WITH_OFFSET, { error: 'must be a time with its UTC offset, such as 2027-10-22T07:30-06:00', abort: true })
      .refine((s) => Number.isFinite(Date.parse(s)), { error: 'is not a real date and time' }),
    socPct: z.number({ error: 'must be a number' }).min(0, { error: 'must be at least 0 %' }).max(100, { error: 'must be at most 100 %' }).optional(),
    restingVolts: z.number({ error: 'must be a number' }).gt(0, { error: 'must be more than 0 V' }).max(100, { error: 'must be at most 100 V' }).optional(),
    /** The saved forecast the phone re-forecast from (its latest); the server uses the trip's latest when left out. */
    forecastId: z.string({ error: 'must be a forecast id' }).min(1).max(100).nullable().optional(),
  })
  .superRefine((v, ctx) => {
    if (v.socPct === undefined && v.restingVolts === undefined) ctx.addIssue({ code: 'custom', path: ['socPct'], message: 'Enter the state of charge (%) or a resting voltage.' });
    if (v.socPct !== undefined && v.restingVolts !== undefined) ctx.addIssue({ code: 'custom', path: ['restingVolts'], message: 'Send either the state of charge or a resting voltage, not both.' });
  });

export type CheckInInput = z.input<typeof checkInInputSchema>;
export type CheckInValues = z.output<typeof checkInInputSchema>;

/** What a check-in re-forecast came to, next to what the saved forecast said. */
export interface CheckInOutcome {
  /** First hour of the re-forecast (local, with offset). */
  startAt: string;
  startSocPct: number;
  firstCutoffAt: string | null;
  /** The next cutoff after the bank reconnects (a reading at the floor cuts off at once; this is when it runs out again). */
  nextCutoffAt: string | null;
  /** When charging first reconnects the bank after its first cutoff; null: it never does before the trip ends (absent on check-ins stored before this was kept). */
  reconnectAt?: string | null;
  /** Hours with unmet load (absent on older check-ins). */
  unmetHours?: number;
  /** Name of the stop where the bank cuts off. */
  cutoffStop: string | null;
  minSocPct: number;
  minSocAt: string;
  endSocPct: number;
  unmetWh: number;
  hoursSimulated: number;
  floorSocPct: number;
}

export interface PreviousOutcome {
  forecastId: string;
  name: string;
  firstCutoffAt: string | null;
  minSocPct: number;
  minSocAt: string;
  endSocPct: number;
}

/** A stored check-in as the API returns it. */
export interface CheckInDto {
  id: string;
  tripId: string;
  at: string;
  source: 'soc' | 'volts';
  socPct: number;
  restingVolts: number | null;
  forecastId: string | null;
  outcome: CheckInOutcome;
  previous: PreviousOutcome | null;
  /** Remarks on the reading (a flat LiFePO4 voltage, surface charge). */
  note: string | null;
  createdBy: { id: string; name: string } | null;
  createdAt: string;
  version: number;
}
