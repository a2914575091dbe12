// The web app's one notifier, kept on globalThis so a development reload does not start
// a second, and closed when the process is asked to stop.
import { createNotifier, type Notifier } from "./notifier";

const holder = globalThis as unknown as { __clocheNotifier?: Promise<Notifier> };

export function startAppNotifier(): Promise<Notifier> {
  if (!holder.__clocheNotifier) {
    holder.__clocheNotifier = createNotifier();
    holder.__clocheNotifier.catch(() => (holder.__clocheNotifier = undefined));
    for (const signal of ["SIGTERM", "SIGINT"] as const) {
      process.once(signal, () => void holder.__clocheNotifier?.then((n) => n.close()).catch(() => undefined));
    }
  }
  return holder.__clocheNotifier;
}
