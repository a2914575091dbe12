// Next.js runs register() once when the server starts. It starts the alert notifier
// (lib/server/alerts/notifier.ts) in the Node.js runtime, unless CLOCHE_NOTIFIER=off.
// A failure here must not break the app: it is logged, and pages and handlers run on
// without e-mailed alerts. CLOCHE_NOTIFIER is read straight from the environment here
// (lib/server/env.ts validates it with the rest when the app first reads its settings).
export async function register() {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  if (process.env.CLOCHE_NOTIFIER === "off") {
    console.log("[notifier] off (CLOCHE_NOTIFIER=off): alerts are not e-mailed by this process");
    return;
  }
  try {
    const { startAppNotifier } = await import("./lib/server/alerts/app-notifier");
    await startAppNotifier();
  } catch (error) {
    console.error("[notifier] could not start; alerts will not be e-mailed until the app restarts:", error instanceof Error ? error.message : error);
  }
}
