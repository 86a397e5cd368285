// One SQL statement against PostgreSQL, for the tests' synchronous database helpers (test-db.ts runs
// this file as a child process, because better-sqlite3's API that the tests use is synchronous).
// Input on stdin: { url, sql, params, mode: 'all' | 'run' }. Output: JSON { rows, changes }.
// Values come back in the app's shapes, as db/client.ts gives them to the app: timestamps as ISO
// strings, booleans as 1/0, JSON columns as their text, counts as numbers.
import pg from 'pg';

pg.types.setTypeParser(pg.types.builtins.INT8, (v) => Number(v));
pg.types.setTypeParser(pg.types.builtins.NUMERIC, (v) => Number(v));
pg.types.setTypeParser(pg.types.builtins.DATE, (v) => v);
pg.types.setTypeParser(pg.types.builtins.JSON, (v) => v);
pg.types.setTypeParser(pg.types.builtins.JSONB, (v) => v);

const chunks = [];
for await (const c of process.stdin) chunks.push(c);
const { url, sql, params, mode } = JSON.parse(Buffer.concat(chunks).toString('utf8'));
const client = new pg.Client({ connectionString: url });
await client.connect();
try {
  const res = await client.query(sql, params);
  const rows = (res.rows ?? []).map((row) => {
    const out = {};
    for (const [k, v] of Object.entries(row)) {
      if (v instanceof Date) out[k] = v.toISOString();
      else if (typeof v === 'boolean') out[k] = v ? 1 : 0;
      else if (Buffer.isBuffer(v)) out[k] = { $bytes: v.toString('base64') };
      else out[k] = v;
    }
    return out;
  });
  process.stdout.write(JSON.stringify({ rows: mode === 'run' ? [] : rows, changes: res.rowCount ?? 0 }));
} finally {
  await client.end();
}
