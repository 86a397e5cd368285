import { z } from 'zod';
import { tripAccess } from '../../../../server/access';
import { db } from '../../../../server/db';
import { createForecast, listForecasts } from '../../../../server/forecasts';
import { json, parseWith, readJson, requireUser, route } from '../../../../server/http';
import { listLoads } from '../../../../server/loads';
import { toRigDto } from '../../../../server/rigs';
import { toTripDto } from '../../../../server/trips';

export const prerender = false;

const runSchema = z.object({
  name: z.string({ error: 'must be text' }).trim().max(100, { error: 'Use at most 100 characters.' }).optional(),
});

/** Saved forecasts of a trip, newest first. */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  const { trip } = await tripAccess(db, user, ctx.params.id!, 'read');
  return json(await listForecasts(db, trip.id));
});

/** Runs the engine on the trip, its rig and the rig's loads as they are now, and saves the result. */
export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  const { trip, rig, canWrite } = await tripAccess(db, user, ctx.params.id!, 'write');
  const hasBody = (ctx.request.headers.get('content-length') ?? '0') !== '0' || ctx.request.headers.has('content-type');
  const body = hasBody ? parseWith(runSchema, await readJson(ctx.request, 16 * 1024)) : {};
  const loads = await listLoads(db, rig.id);
  const saved = await createForecast(db, {
    rig: toRigDto(rig, canWrite),
    loads,
    trip: toTripDto(trip, canWrite),
    userId: user.id,
    name: body.name,
  });
  return json(saved, 201);
});
