// The web app's one notifier, kept on globalThis so a development reload does not start
// a second. It is not closed on exit: its timer does not keep the process alive, and an
// e-mail claimed when the process stopped is sent again once its claim runs out.
import { createNotifier, type Notifier } from "./notifier";

const holder = globalThis as unknown as { __clocheNotifier?: Promise<Notifier> };

export function startAppNotifier(): Promise<Notifier> {
  if (!holder.__clocheNotifier) {
    holder.__clocheNotifier = createNotifier();
    holder.__clocheNotifier.catch(() => (holder.__clocheNotifier = undefined));
  }
  return holder.__clocheNotifier;
}
