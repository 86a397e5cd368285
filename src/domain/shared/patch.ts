import { z } from 'zod';

type Undefaulted<T> = T extends z.ZodDefault<infer Inner> ? Inner : T;

/** The shape of a PATCH body: each field optional, and a field that is not sent keeps no default. */
export type PatchShape<Shape extends z.ZodRawShape> = { [K in keyof Shape]: z.ZodOptional<Undefaulted<Shape[K]>> };

/**
 * Every field of an input schema made optional *without* its default. zod's own `.partial()`
 * still applies `.default(…)` to a missing key, so a PATCH that only renames a rig would come back
 * with `arrays: []` and wipe the rig's panels; this keeps "not sent" as "not changed".
 */
export function patchOf<Shape extends z.ZodRawShape>(schema: z.ZodObject<Shape>): z.ZodObject<PatchShape<Shape>> {
  const shape: Record<string, z.ZodType> = {};
  for (const [key, field] of Object.entries(schema.shape)) {
    const inner = field instanceof z.ZodDefault ? (field.unwrap() as z.ZodType) : (field as z.ZodType);
    shape[key] = inner.optional();
  }
  return z.object(shape) as unknown as z.ZodObject<PatchShape<Shape>>;
}

/** The version a client read; every PATCH sends it so a stale write becomes a 409, not an overwrite. */
export const versionField = z
  .number({ error: 'Send the version you read.' })
  .int({ error: 'must be a whole number' })
  .min(1, { error: 'must be at least 1' });
