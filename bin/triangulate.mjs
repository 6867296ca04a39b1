#!/usr/bin/env node
// The `triangulate` command. The sources are TypeScript, so they are loaded through tsx's
// ESM loader (registered for this process only, with the project's tsconfig so that its
// path aliases resolve from any working directory); lib/cli/main.ts does the rest.
import { fileURLToPath } from "node:url";
import { register } from "tsx/esm/api";

register({ tsconfig: fileURLToPath(new URL("../tsconfig.json", import.meta.url)) });
const { main } = await import("../lib/cli/main.ts");
process.exitCode = await main(process.argv.slice(2));
