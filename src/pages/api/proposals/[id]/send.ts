import { proposalAccess } from '../../../../server/access';
import { appOrigin } from '../../../../server/app-url';
import { db } from '../../../../server/db';
import { json, parseWith, readJson, requireUser, route } from '../../../../server/http';
import { sendProposal } from '../../../../server/proposals';
import { proposalSendSchema } from '../../../../domain/proposals/proposals.schema';

export const prerender = false;

/** Sends a draft to the crew (its installer): the crew's owners get an e-mail with the link. */
export const POST = route(async (ctx) => {
  const user = requireUser(ctx);
  const a = await proposalAccess(db, user, ctx.params.id!, 'write');
  const { version } = parseWith(proposalSendSchema, await readJson(ctx.request, 4 * 1024));
  return json(await sendProposal(db, a.proposal, a, user.id, version, appOrigin(ctx.url)));
});
