import { db } from '../../../server/db';
import { crewAccess } from '../../../server/access';
import { createCrew, crewDetail, listCrews } from '../../../server/crews';
import { HttpError } from '../../../server/errors';
import { json, parseWith, readJson, requireUser, route } from '../../../server/http';
import { crewCreateSchema } from '../../../domain/crews/crews.schema';

/** The crews the user is in, with their role and which one is active (installers are in none). */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  return json(await listCrews(db, user.id));
});

/** Starts another crew with the user as its owner (campers only); it becomes the active crew. */
export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  if ((user as { kind?: string }).kind === 'installer') {
    throw new HttpError('forbidden', 'Installer accounts do not have crews; crews share rigs with you instead.');
  }
  const input = parseWith(crewCreateSchema, await readJson(ctx.request));
  const id = await createCrew(db, user.id, input.name);
  const role = await crewAccess(db, user, id, 'read');
  return json(await crewDetail(db, id, user.id, role), 201, { location: `/api/crews/${id}` });
});
