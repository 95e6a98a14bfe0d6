// The exact solver, one file per idea (read in this order):
//   basis.ts      the closed-form basis of a piece and its evaluation
//   bracket.ts    the one root bracketer
//   regimes.ts    the regimes and their entry/exit conditions, as data
//   pieces.ts     the closed form of a piece in each regime (output and capacitor state)
//   scan.ts       first exit, monitored crossings and extrema inside a piece
//   rail-hold.ts  the fast path while the output sits at a rail
//   solver.ts     the piece loop
//
// Garbage: a noisy run makes a million pieces and tens of thousands of calls, and `npm run
// bench` expects no garbage collection during its timed runs. In V8's optimised code a double
// that is passed to, or returned from, a call that V8 does not inline is boxed into a new heap
// number, and so is a loop variable that starts from an argument or property of unknown type
// or that the function returns. So on the hot paths numbers cross calls in fields and small
// typed arrays (ExactSolver.t/tb/holdNumbers, PieceModel.startVo/startX/cap, Scanner.start/
// span/exit/best and its probe, the bracket of bracketRoot, Recorder.crossingTime), loop
// variables start through unary plus, and the helpers that take numbers are small enough to
// be inlined. Check a change with the bench's GC column (and its sampled allocation, if
// needed, with the inspector's HeapProfiler sampling, collected objects included).
export { ExactSolver, type ExactParams } from "./solver";
