// Shared number shapes of every schema file: each message names the field it checks.
import { z } from "zod";

/** Largest supply, reference or signal level accepted anywhere, in volts. */
export const MAX_ABS_VOLTS = 1000;

export const finite = (what: string) =>
  z.number({ error: `${what} must be a number` }).refine(Number.isFinite, { message: `${what} must be finite` });

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
