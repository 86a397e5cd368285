import type { Kysely } from 'kysely';
import type { DB } from '../../db/schema';
import type { ActivityDto } from '../domain/crews/crews.schema';

/** A page of a rig's load activity, newest first; `before` is the cursor (`at|id`) of the last entry already shown. */
export async function listActivity(db: Kysely<DB>, rigId: string, opts: { limit: number; before?: string }): Promise<{ items: ActivityDto[]; nextBefore: string | null }> {
  let q = db
    .selectFrom('load_activity')
    .leftJoin('user', 'user.id', 'load_activity.user_id')
    .select([
      'load_activity.id as id',
      'load_activity.load_id as loadId',
      'load_activity.load_name as loadName',
      'load_activity.action as action',
      'load_activity.changes as changes',
      'load_activity.at as at',
      'user.name as by',
    ])
    .where('load_activity.rig_id', '=', rigId);
  if (opts.before) {
    // Entries written together (an import) share `at`, so the cursor carries the id too.
    const [at, id = ''] = opts.before.split('|');
    q = q.where((eb) => eb.or([eb('load_activity.at', '<', at!), eb.and([eb('load_activity.at', '=', at!), eb('load_activity.id', '<', id)])]));
  }
  const rows = await q.orderBy('load_activity.at', 'desc').orderBy('load_activity.id', 'desc').limit(opts.limit + 1).execute();
  const page = rows.slice(0, opts.limit);
  return {
    items: page.map((r) => {
      let changes: ActivityDto['changes'] = {};
      try {
        const parsed = JSON.parse(r.changes) as unknown;
        if (parsed && typeof parsed === 'object' && !Array.isArray(parsed)) changes = parsed as ActivityDto['changes'];
      } catch {
        changes = {};
      }
      return { id: r.id, loadId: r.loadId, loadName: r.loadName, action: r.action, by: r.by ?? null, changes, at: r.at };
    }),
    nextBefore: rows.length > opts.limit ? `${page[page.length - 1]!.at}|${page[page.length - 1]!.id}` : null,
  };
}
