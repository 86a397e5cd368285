// The contract's error envelope for plans the schema refuses (forecast-engine.md, "Contract").

/** One refused field: a dot path such as `stops.0.arrive` and a plain-English message. */
export interface PlanIssue {
  path: string;
  message: string;
}

/** `{ error: { code: 'invalid_plan', message }, issues: [{ path, message }] }` — the API's 400 body. */
export interface InvalidPlanEnvelope {
  error: { code: 'invalid_plan'; message: string };
  issues: PlanIssue[];
}

/** Thrown by the engine's typed entry points when handed a plan or variant that does not validate. */
export class PlanValidationError extends Error {
  readonly envelope: InvalidPlanEnvelope;
  constructor(envelope: InvalidPlanEnvelope) {
    super(envelope.error.message);
    this.name = 'PlanValidationError';
    this.envelope = envelope;
  }
}

interface ZodLikeIssue {
  path: PropertyKey[];
  message: string;
}

/** Joins a zod issue path with dots (`['stops', 0, 'arrive']` → `stops.0.arrive`). */
export function issuePath(path: PropertyKey[]): string {
  return path.map((p) => (typeof p === 'symbol' ? p.description ?? '' : String(p))).join('.');
}

/** Turns zod issues into the contract's envelope; the summary message names the first field. */
export function zodIssuesToEnvelope(issues: ZodLikeIssue[], summary = 'The plan is invalid.'): InvalidPlanEnvelope {
  const list = issues.map((i) => ({ path: issuePath(i.path), message: i.message }));
  const first = list[0];
  const message = first
    ? `${summary} ${first.path ? `${first.path}: ` : ''}${first.message}${list.length > 1 ? ` (and ${list.length - 1} more)` : ''}`
    : summary;
  return { error: { code: 'invalid_plan', message }, issues: list };
}
