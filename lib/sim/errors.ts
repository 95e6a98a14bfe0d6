// Errors of the simulation core. Kept in a module of their own so the browser client can test
// `instanceof SimCancelled` without pulling the solver into the main bundle.

/** Thrown when a run is cancelled (options.shouldCancel returned true, or the worker was stopped). */
export class SimCancelled extends Error {
  constructor(message = "Simulation cancelled") {
    super(message);
    this.name = "SimCancelled";
  }
}

/** Thrown when a solver gives up (e.g. odex reached its step limit). */
export class SimFailed extends Error {
  constructor(message: string) {
    super(message);
    this.name = "SimFailed";
  }
}
