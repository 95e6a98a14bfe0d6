// Shared number shapes of every schema file: each message names the field it checks.
import { z } from "zod";

/** Largest supply, reference or signal level accepted anywhere, in volts. */
export const MAX_ABS_VOLTS = 1000;

// zod 4's z.number() refuses NaN and ±Infinity itself: no refine (each copies the schema, which
// the `railwise` bin pays for at every start), only a message for each case.
export const finite = (what: string) =>
  z.number({
    error: (issue) => (typeof issue.input === "number" ? `${what} must be finite` : `${what} must be a number`),
  });

export const volts = (what: string) =>
  finite(what).refine((v) => Math.abs(v) <= MAX_ABS_VOLTS, { message: `${what} must be within ±${MAX_ABS_VOLTS} V` });

export const positive = (what: string, max = Number.MAX_VALUE) =>
  finite(what)
    .refine((v) => v > 0, { message: `${what} must be greater than 0` })
    .refine((v) => v <= max, { message: `${what} must be at most ${max}` });

export const nonNegative = (what: string, max = Number.MAX_VALUE) =>
  finite(what)
    .refine((v) => v >= 0, { message: `${what} must not be negative` })
    .refine((v) => v <= max, { message: `${what} must be at most ${max}` });
