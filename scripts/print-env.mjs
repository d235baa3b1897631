// Print the local services' environment as shell exports: eval "$(node scripts/print-env.mjs test)".
import { localEnv } from "./lib/env.mjs";

const mode = process.argv[2] === "test" ? "test" : "app";
for (const [k, v] of Object.entries(localEnv(mode))) console.log(`export ${k}=${JSON.stringify(v)}`);
