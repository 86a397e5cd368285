import { proposalAccess } from '../../../../server/access';
import { appOrigin } from '../../../../server/app-url';
import { db } from '../../../../server/db';
import { json, parseWith, readJson, requireUser, route } from '../../../../server/http';
import { decideProposal } from '../../../../server/proposals';
import { decisionSchema } from '../../../../domain/proposals/proposals.schema';

export const prerender = false;

/** The crew owner accepts or declines a sent proposal, with a comment; the installer is told by e-mail. */
export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  const a = await proposalAccess(db, user, ctx.params.id!, 'decide');
  const body = parseWith(decisionSchema, await readJson(ctx.request, 8 * 1024));
  return json(await decideProposal(db, a.proposal, a, user, body, appOrigin(ctx.url)));
});
