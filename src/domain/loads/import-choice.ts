// What a CSV import of loads does to the list: add to it or replace it. Pure and zod-free, shared by
// the import route (its preview) and the import panel.

/** How an import meets the list: its loads are added after the list, or the list is replaced by them. */
export type ImportMode = 'add' | 'replace';

/** A name as the list compares it: case, outer spaces and runs of spaces do not matter. */
export function nameKey(name: string): string {
  return name.trim().replace(/\s+/g, ' ').toLocaleLowerCase('en');
}

/** The file's rows whose names are already in the list (an import of the list's own export has them all). */
export function namesAlreadyListed(rows: readonly { line: number; name: string }[], list: readonly { name: string }[]): { line: number; name: string }[] {
  const listed = new Set(list.map((l) => nameKey(l.name)));
  return rows.filter((r) => listed.has(nameKey(r.name))).map((r) => ({ line: r.line, name: r.name }));
}

/** "3 loads", "1 load". */
export function countLoads(n: number): string {
  return `${n} ${n === 1 ? 'load' : 'loads'}`;
}

/** The words on the import button for a mode: what will happen to the list. */
export function importButtonLabel(mode: ImportMode, adding: number, removing: number): string {
  if (mode === 'replace') return removing > 0 ? `Replace ${countLoads(removing)} with ${countLoads(adding)}` : `Import ${countLoads(adding)}`;
  return `Add ${countLoads(adding)} to the list`;
}
