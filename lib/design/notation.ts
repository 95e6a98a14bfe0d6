// Engineering notation (4.7k, 100n, 2.2M, 10u/10µ, optional unit) and IEC 60062 RKM codes
// (4K7, 2R2, 1M0, 470R, 4n7, R47). Small on purpose: no npm package does both with the
// IEC letter-as-decimal-point rule, and this file is fully covered by tests/unit/design-notation.test.ts.

/** SI prefixes accepted on input. "K" is tolerated as kilo (common on schematics and in RKM). */
const PREFIX: Record<string, number> = {
  f: 1e-15,
  p: 1e-12,
  n: 1e-9,
  u: 1e-6,
  µ: 1e-6, // U+00B5 micro sign
  μ: 1e-6, // U+03BC Greek mu
  m: 1e-3,
  k: 1e3,
  K: 1e3,
  M: 1e6,
  G: 1e9,
  T: 1e12,
};

/** RKM letters: the letter both scales and marks the decimal point. R = ×1 (resistors), F = ×1 (capacitors). */
const RKM_LETTER: Record<string, number> = {
  R: 1,
  r: 1,
  K: 1e3,
  k: 1e3,
  M: 1e6,
  G: 1e9,
  T: 1e12,
  p: 1e-12,
  n: 1e-9,
  u: 1e-6,
  µ: 1e-6,
  μ: 1e-6,
  m: 1e-3,
  F: 1,
};

// Unit suffixes we strip (case-sensitive where a letter collides with a prefix).
const UNIT_RE = /\s*(Ω|Ω|ohms?|Ohms?|OHMS?|F|V|Hz|hz|HZ|A|s)?$/;

const ENG_RE = /^([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*([fpnuµμmkKMGT])?$/;
/** "meg" in any case after a number: a netlist habit, not SI or IEC 60062 — refused with advice. */
const MEG_RE = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?\s*meg/i;
const RKM_RE = /^(\d*)([RrKkMGTpnuµμmF])(\d*)$/;

/**
 * Why `text` is not a quantity, in words for the person typing it, or null when it parses.
 * "meg" (any case) is answered with what to write instead: SI "M" (2.2M) or the RKM code (2M2).
 */
export function quantityProblem(text: string): string | null {
  const trimmed = typeof text === "string" ? text.trim() : "";
  if (!trimmed) return "required";
  if (parseQuantity(trimmed) !== null) return null;
  if (MEG_RE.test(trimmed)) return 'write M for mega (2.2M or RKM 2M2), not "meg"';
  return "not a value";
}

/**
 * Parse "4.7k", "100 nF", "2.2M", "10µ", "1e-3", "4K7", "2R2", "1M0", "470R", "4n7", "R47".
 * Returns null when the text is not a quantity (never throws).
 */
export function parseQuantity(text: string): number | null {
  if (typeof text !== "string") return null;
  const trimmed = text.trim();
  if (!trimmed) return null;

  // RKM first: "4K7" would otherwise never match, and "470R" has R in the unit position.
  const rkm = parseRkm(trimmed);
  if (rkm !== null) return rkm;

  const body = trimmed.replace(UNIT_RE, "");
  if (!body) return null;
  const m = ENG_RE.exec(body);
  if (!m) {
    // A bare RKM code followed by a unit, e.g. "4K7 Ω" or "4n7F".
    return body !== trimmed ? parseRkm(body) : null;
  }
  const mantissa = Number(m[1]);
  const scale = m[2] ? PREFIX[m[2]] : 1;
  const v = mantissa * scale;
  return Number.isFinite(v) ? tidy(v) : null;
}

function parseRkm(text: string): number | null {
  const m = RKM_RE.exec(text);
  if (!m) return null;
  const [, whole, letter, frac] = m;
  if (!whole && !frac) return null;
  // "4n7" style is RKM; but "100n" (no fraction) is also plain engineering — both give the same value.
  const v = Number(`${whole || "0"}.${frac || "0"}`) * RKM_LETTER[letter];
  return Number.isFinite(v) ? tidy(v) : null;
}

/** Remove binary noise such as 4.7 * 1e3 = 4700.000000000001. */
function tidy(v: number): number {
  return v === 0 ? 0 : Number(v.toPrecision(12));
}

const FORMAT_PREFIXES: [number, string][] = [
  [1e12, "T"],
  [1e9, "G"],
  [1e6, "M"],
  [1e3, "k"],
  [1, ""],
  [1e-3, "m"],
  [1e-6, "µ"],
  [1e-9, "n"],
  [1e-12, "p"],
  [1e-15, "f"],
];

/** Pick the prefix for |v| so that the mantissa rounded to `digits` lies in [1, 1000). */
function splitEngineering(v: number, digits: number): { mantissa: number; prefix: string; scale: number } {
  const a = Math.abs(v);
  for (const [scale, prefix] of FORMAT_PREFIXES) {
    const mant = Number((a / scale).toPrecision(digits));
    if (mant >= 1 && mant < 1000) return { mantissa: Math.sign(v) * mant, prefix, scale };
  }
  // Outside f…T: fall back to the smallest/largest prefix.
  const [scale, prefix] = a >= 1 ? FORMAT_PREFIXES[0] : FORMAT_PREFIXES[FORMAT_PREFIXES.length - 1];
  return { mantissa: Number((v / scale).toPrecision(digits)), prefix, scale };
}

/** "4.7 kΩ", "100 nF", "2.5 V", "-1.2 mV"; `digits` significant figures, trailing zeros dropped. */
export function formatQuantity(value: number, unit: string, digits = 3): string {
  if (!Number.isFinite(value)) return `${value} ${unit}`.trim();
  const d = Math.max(1, Math.min(15, Math.round(digits)));
  if (value === 0) return unit ? `0 ${unit}` : "0";
  const { mantissa, prefix } = splitEngineering(value, d);
  const text = String(mantissa);
  return unit ? `${text} ${prefix}${unit}` : `${text}${prefix}`;
}

/**
 * IEC 60062 RKM code of a resistance: 4700 → "4K7", 2.2 → "2R2", 1e6 → "1M0", 470 → "470R",
 * 10 000 → "10K", 0.47 → "R47". Three significant figures by default (enough for E192).
 */
export function formatRkm(ohms: number, digits = 3): string {
  if (!Number.isFinite(ohms) || ohms <= 0)
    throw new RangeError(`formatRkm needs a positive, finite resistance (got ${ohms})`);
  const d = Math.max(1, Math.min(6, Math.round(digits)));
  const letters: [number, string][] = [
    [1e12, "T"],
    [1e9, "G"],
    [1e6, "M"],
    [1e3, "K"],
    [1, "R"],
  ];
  for (const [scale, letter] of letters) {
    const mant = Number((ohms / scale).toPrecision(d));
    if (mant >= 1 && mant < 1000) return rkmFromMantissa(mant, letter);
  }
  // Below 1 Ω: "R47".
  const mant = Number(ohms.toPrecision(d));
  return rkmFromMantissa(mant, "R");
}

function rkmFromMantissa(mant: number, letter: string): string {
  const [whole, frac = ""] = String(mant).split(".");
  if (whole === "0") return `${letter}${frac}`;
  // A single-digit whole value keeps a trailing 0 (1M0, 1K0, 2R0) so the letter is never last
  // and the code cannot be misread; two or more digits end in the letter (10K, 470R).
  if (!frac) return whole.length === 1 ? `${whole}${letter}0` : `${whole}${letter}`;
  return `${whole}${letter}${frac}`;
}

/**
 * Axis tick labels in engineering notation with one SI prefix for the whole axis, and as many
 * decimals as the ticks need to show their own values: steps of 0.25 s read 0.00, 0.25, 0.50 s;
 * steps of 2.5 V read 0.0, 2.5, 5.0 V. The prefix follows the largest tick magnitude.
 */
export function formatTicks(values: readonly number[], unit: string): string[] {
  let span = 0;
  for (const v of values) if (Number.isFinite(v)) span = Math.max(span, Math.abs(v));
  let scale = 1;
  let prefix = "";
  if (span > 0) {
    for (const [s, p] of FORMAT_PREFIXES) {
      if (span / s >= 1 - 1e-12) {
        scale = s;
        prefix = p;
        break;
      }
      scale = s;
      prefix = p;
    }
  }
  const scaled = values.map((v) => v / scale);
  let decimals = 0;
  for (; decimals < 9; decimals++) {
    const f = 10 ** decimals;
    // Every tick must round-trip at this many decimals (relative to the tick spacing).
    const ok = scaled.every(
      (x) => !Number.isFinite(x) || Math.abs(Math.round(x * f) / f - x) <= 1e-6 * Math.max(1e-9, tickStep(scaled)),
    );
    if (ok) break;
  }
  const sep = unit || prefix ? " " : "";
  return scaled.map((x) => {
    if (!Number.isFinite(x)) return "";
    const text = (Object.is(Math.round(x * 10 ** decimals), -0) ? 0 : x)
      .toFixed(decimals)
      .replace(/^-0(\.0+)?$/, "0$1");
    return `${text}${sep}${prefix}${unit}`;
  });
}

function tickStep(xs: readonly number[]): number {
  let step = Infinity;
  for (let i = 1; i < xs.length; i++) {
    const d = Math.abs(xs[i] - xs[i - 1]);
    if (d > 0 && d < step) step = d;
  }
  return Number.isFinite(step) ? step : Math.max(1, Math.abs(xs[0] ?? 1));
}
