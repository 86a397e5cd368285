import { proposalAccess } from '../../../../server/access';
import { db } from '../../../../server/db';
import { json, parseWith, readJson, requireUser, route } from '../../../../server/http';
import { deleteProposal, patchProposal, toDto } from '../../../../server/proposals';
import { versionFrom } from '../../../../server/versions';
import { proposalPatchSchema } from '../../../../domain/proposals/proposals.schema';

export const prerender = false;

/** A proposal with its before/after forecasts, parts, cable checks and cautions. */
export const GET = route(async (ctx) => {
  const user = requireUser(ctx);
  const a = await proposalAccess(db, user, ctx.params.id!, 'read');
  return json(await toDto(db, a.proposal, a, user.id));
});

/** Edits a draft (its installer): title, notes, currency, parts, cable runs; 409 when stale or already sent. */
export const PATCH = route(async (ctx) => {
  const user = requireUser(ctx);
  const a = await proposalAccess(db, user, ctx.params.id!, 'write');
  const body = parseWith(proposalPatchSchema, await readJson(ctx.request, 64 * 1024));
  return json(await patchProposal(db, a.proposal, a, user.id, body));
});

/** Deletes a draft (its installer), `?version=N`. */
export const DELETE = route(async (ctx) => {
  const user = requireUser(ctx);
  const a = await proposalAccess(db, user, ctx.params.id!, 'write');
  await deleteProposal(db, a.proposal, a, user.id, versionFrom(ctx.url, ctx.request.headers));
  return new Response(null, { status: 204 });
});
