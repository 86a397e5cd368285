import { db } from '../../../server/db';
import { json, parseWith, readJson, requireUser, route } from '../../../server/http';
import { savedPricesOrThrow } from '../../../server/price-lists';
import { createProposal, forecastForInstaller, listProposals } from '../../../server/proposals';
import { proposalFromSchema } from '../../../domain/proposals/hand-proposal';

export const prerender = false;

/** The proposals the user sees: an installer's own, or those sent to the user's crews. */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  return json(await listProposals(db, user as typeof user & { kind?: string }));
});

/** A draft proposal from a saved forecast and one sweep option or a hand-edited after-plan (installers with a grant on the forecast's rig). */
export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  const body = parseWith(proposalFromSchema, await readJson(ctx.request, 64 * 1024));
  const { forecast, access } = await forecastForInstaller(db, user, body.forecastId, 'forecastId');
  const prices = body.prices ?? (await savedPricesOrThrow(db, user.id));
  return json(await createProposal(db, { forecast, access, installer: { id: user.id, name: user.name, units: (user as { units?: unknown }).units }, changes: body.changes, handPlan: body.handPlan, prices, title: body.title }), 201);
});
