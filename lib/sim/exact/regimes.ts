// The regimes of the behavioural op-amp model and the conditions that enter and leave them,
// written as data. In each regime the model is linear:
//   linear     dvo/dt = drive = ωp·(A0·vd − vo)
//   slew-up    dvo/dt = +SR          (entered when drive > SR)
//   slew-down  dvo/dt = −SRfall      (entered when drive < −SRfall)
//   rail-high  vo = Voh              (while drive ≥ 0)
//   rail-low   vo = Vol              (while drive ≤ 0)
// "drive" is always the linear-regime rate ωp·(A0·vd − vo), evaluated on the regime's own
// closed form, so an exit condition and the entry condition of the regime it leads to are the
// same inequality.

export const LINEAR = 0;
export const SLEW_UP = 1;
export const SLEW_DOWN = 2;
export const RAIL_HIGH = 3;
export const RAIL_LOW = 4;
export type Regime = typeof LINEAR | typeof SLEW_UP | typeof SLEW_DOWN | typeof RAIL_HIGH | typeof RAIL_LOW;
export const REGIME_NAMES = ["linear", "slew-up", "slew-down", "rail-high", "rail-low"] as const;

/** Levels a condition compares with; `levelValues` gives their numbers for one run. */
export const LEVEL_SLEW_RISE = 0; // +SR
export const LEVEL_SLEW_FALL = 1; // −SRfall
export const LEVEL_HIGH = 2; // Voh
export const LEVEL_LOW = 3; // Vol
export const LEVEL_ZERO = 4; // 0
export type Level =
  | typeof LEVEL_SLEW_RISE
  | typeof LEVEL_SLEW_FALL
  | typeof LEVEL_HIGH
  | typeof LEVEL_LOW
  | typeof LEVEL_ZERO;

export function levelValues(slewRate: number, slewRateFall: number, high: number, low: number): Float64Array {
  return Float64Array.of(slewRate, -slewRateFall, high, low, 0);
}

/** The quantity a condition watches. */
export const DRIVE = 0;
export const OUTPUT = 1;

/** Leave for `to` when sign·(quantity − level) > 0. */
export interface Exit {
  to: Regime;
  quantity: typeof DRIVE | typeof OUTPUT;
  sign: 1 | -1;
  level: Level;
}

export const EXITS: readonly (readonly Exit[])[] = [
  // linear
  [
    { to: SLEW_UP, quantity: DRIVE, sign: 1, level: LEVEL_SLEW_RISE },
    { to: SLEW_DOWN, quantity: DRIVE, sign: -1, level: LEVEL_SLEW_FALL },
    { to: RAIL_HIGH, quantity: OUTPUT, sign: 1, level: LEVEL_HIGH },
    { to: RAIL_LOW, quantity: OUTPUT, sign: -1, level: LEVEL_LOW },
  ],
  // slew-up
  [
    { to: LINEAR, quantity: DRIVE, sign: -1, level: LEVEL_SLEW_RISE },
    { to: RAIL_HIGH, quantity: OUTPUT, sign: 1, level: LEVEL_HIGH },
  ],
  // slew-down
  [
    { to: LINEAR, quantity: DRIVE, sign: 1, level: LEVEL_SLEW_FALL },
    { to: RAIL_LOW, quantity: OUTPUT, sign: -1, level: LEVEL_LOW },
  ],
  // rail-high
  [{ to: LINEAR, quantity: DRIVE, sign: -1, level: LEVEL_ZERO }],
  // rail-low
  [{ to: LINEAR, quantity: DRIVE, sign: 1, level: LEVEL_ZERO }],
];

/**
 * Entry conditions, tried in order (the first that holds wins): the output at a limit with
 * the drive pushing into it, then the drive beyond a slew limit, else linear.
 * `output` compares vo with the level (≥ for +1, ≤ for −1); `drive` likewise, strictly when
 * `strict` (a drive exactly at a slew limit is the same motion either way).
 */
export interface Entry {
  regime: Regime;
  output?: { sign: 1 | -1; level: Level };
  drive: { sign: 1 | -1; level: Level; strict: boolean };
}

export const ENTRIES: readonly Entry[] = [
  { regime: RAIL_HIGH, output: { sign: 1, level: LEVEL_HIGH }, drive: { sign: 1, level: LEVEL_ZERO, strict: false } },
  { regime: RAIL_LOW, output: { sign: -1, level: LEVEL_LOW }, drive: { sign: -1, level: LEVEL_ZERO, strict: false } },
  { regime: SLEW_UP, drive: { sign: 1, level: LEVEL_SLEW_RISE, strict: true } },
  { regime: SLEW_DOWN, drive: { sign: -1, level: LEVEL_SLEW_FALL, strict: true } },
];

/** The regime the state (vo and the drive at the start of a piece) calls for. */
export function enterRegime(vo: number, drive: number, levels: Float64Array): Regime {
  for (const e of ENTRIES) {
    if (e.output && !(e.output.sign * (vo - levels[e.output.level]) >= 0)) continue;
    const d = e.drive.sign * (drive - levels[e.drive.level]);
    if (e.drive.strict ? d > 0 : d >= 0) return e.regime;
  }
  return LINEAR;
}

export const isRail = (r: Regime): boolean => r === RAIL_HIGH || r === RAIL_LOW;
