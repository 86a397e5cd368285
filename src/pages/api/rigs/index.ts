import { crewAccess, crewForNewRig } from '../../../server/access';
import { db } from '../../../server/db';
import { json, parseWith, readJson, requireUser, route } from '../../../server/http';
import { createRig, listRigs } from '../../../server/rigs';
import { rigInputSchema } from '../../../domain/rigs/rigs.schema';

/** The rigs of every crew the user is in. */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  return json(await listRigs(db, user.id));
});

/** Adds a rig to `crewId`, or to the user's first crew they own or edit. */
export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  const input = parseWith(rigInputSchema, await readJson(ctx.request));
  const crewId = await crewForNewRig(db, user, input.crewId);
  const rig = await createRig(db, user.id, crewId, input, (await crewAccess(db, user, crewId, 'read')) === 'owner');
  return json(rig, 201, { location: `/api/rigs/${rig.id}` });
});
