// `tsx scripts/simulate.ts <scenario.json|-> …`: the simulate command run from source, without
// the bundle (the same code as `railwise simulate`, scripts/cli/simulate-command.ts).
// `npm run simulate` runs the compiled bin instead (scripts/cli/launch.mjs).
import { runSimulate } from "./cli/simulate-command";

runSimulate(process.argv.slice(2));
