/**
 * Runs once when the server starts (Next.js instrumentation hook): validates the settings in the
 * environment (lib/env.ts). A wrong or missing setting stops the server with a message naming it.
 */
export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME === "nodejs") {
    const { checkEnvAtStartup } = await import("./lib/env-startup");
    checkEnvAtStartup();
  }
}
