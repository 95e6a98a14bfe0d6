// The exact solver, one file per idea (read in this order):
//   basis.ts      the closed-form basis of a piece and its evaluation
//   bracket.ts    the one root bracketer
//   regimes.ts    the regimes and their entry/exit conditions, as data
//   pieces.ts     the closed form of a piece in each regime (output and capacitor state)
//   scan.ts       first exit, monitored crossings and extrema inside a piece
//   rail-hold.ts  the fast path while the output sits at a rail
//   solver.ts     the piece loop
export { ExactSolver, type ExactParams } from "./solver";
