// Entry file of a pool worker (lib/work/pool.ts): plain JavaScript, so that Node can start it
// from the source tree in every mode (production server, dev server, tests); it loads the
// TypeScript worker through tsx, which also resolves the project's "@/" paths.
import { tsImport } from "tsx/esm/api";

await tsImport("./worker.ts", import.meta.url);
