// Re-export of odex's compiled JavaScript. The package ships a TypeScript source that fails
// strict type-checking and no declarations, so the types live in the hand-written odex.d.ts
// beside this file (see DEVELOPERS.md § Stack notes).
export { Solver, Outcome } from "odex/src/odex.js";
