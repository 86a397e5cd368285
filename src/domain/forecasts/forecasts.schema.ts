import { z } from 'zod';

// Request shapes of saved forecasts.

/** Running a trip's forecast: an optional name (the time of the run when left out). */
export const forecastRunSchema = z.object({
  name: z.string({ error: 'must be text' }).trim().max(100, { error: 'Use at most 100 characters.' }).optional(),
});
export type ForecastRunInput = z.input<typeof forecastRunSchema>;
