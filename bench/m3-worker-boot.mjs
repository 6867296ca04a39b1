// Entry file of a worker thread of the M3 bench (bench/m3-coverage.ts): plain JavaScript, so that
// Node can start it; it loads the TypeScript worker through tsx, as lib/work/worker-boot.mjs does.
import { tsImport } from "tsx/esm/api";

await tsImport("./m3-worker.ts", import.meta.url);
