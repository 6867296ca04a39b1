import { env } from "./env";

/** Validates the settings (lib/env.ts); on error prints what to fix and ends the process (exit 1). */
export function checkEnvAtStartup(): void {
  try {
    env();
  } catch (err) {
    console.error((err as Error).message);
    process.exit(1);
  }
}
