// `tsx scripts/design.ts <spec.json|->`: the design command run from source, without the bundle
// (the same code as `railwise design`, scripts/cli/design-command.ts).
// `npm run design` runs the compiled bin instead (scripts/cli/launch.mjs).
import { runDesign } from "./cli/design-command";

runDesign(process.argv.slice(2));
