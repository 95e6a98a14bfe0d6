// `npm run simulate|design -- …`: rebuild the `railwise` bundle when it is missing or older
// than its sources (scripts/build-cli.mjs), then run it in this same process with the same
// arguments, so the npm scripts always run the current code through the bin.
import { createRequire } from "node:module";
import { bundlePath, buildCli, staleReason } from "../build-cli.mjs";

if (staleReason()) await buildCli();
createRequire(import.meta.url)(bundlePath);
