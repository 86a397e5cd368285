import { db } from '../../../server/db';
import { listCrews, switchActiveCrew } from '../../../server/crews';
import { json, parseWith, readJson, requireUser, route } from '../../../server/http';
import { activeCrewSchema } from '../../../domain/crews/crews.schema';

/** Switches the crew the Crew page manages and new rigs go into; answers the crew list. */
export const PUT = route(async (ctx) => {
  const user = requireUser(ctx);
  const { crewId } = parseWith(activeCrewSchema, await readJson(ctx.request));
  await switchActiveCrew(db, user.id, crewId);
  return json(await listCrews(db, user.id));
});
