// Every error code an API answer can carry (`{ error: code, message }`) and its one HTTP status.
// No "server-only" import: the simulation worker (sim-worker.ts) answers these codes too.
export const ERROR_STATUS = {
  invalid_input: 400,
  invalid_json: 400,
  unauthorized: 401,
  forbidden: 403,
  cross_origin: 403,
  unsupported_content_type: 403,
  not_found: 404,
  conflict: 409,
  gone: 410,
  too_large: 413,
  over_budget: 422,
  over_memory: 422,
  rate_limited: 429,
  internal: 500,
  busy: 503,
  unavailable: 503,
} as const;

export type ErrorCode = keyof typeof ERROR_STATUS;
