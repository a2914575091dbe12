// "Control stopped": the controller cannot report its own absence, so the web app watches
// its heartbeat and is the only writer of controller_silent alerts (one per site while it
// lasts). A clean stop or a restart is given the same grace as a missed beat, so a quick
// restart sends nothing.
import { getControllerStatus } from "@/db/queries/controller-status";
import { clearControllerSilentAlert, getOpenControllerSilentAlert, raiseControllerSilentAlert, type NotifierSite } from "@/db/queries/alert-outbox";
import { localTime } from "@/lib/alerts/mail-text";

export async function checkControlStopped(site: NotifierSite, { now, silentAfterMs, watchingSince }: { now: Date; silentAfterMs: number; watchingSince: Date }) {
  const status = await getControllerStatus({ siteId: site.id, now });
  // Nothing heard at all counts from when this notifier started watching.
  const heardAt = Math.max(status.lastBeatAt?.getTime() ?? -Infinity, watchingSince.getTime());
  const silent = now.getTime() - heardAt > silentAfterMs;
  const open = await getOpenControllerSilentAlert({ siteId: site.id });
  if (silent && !open) {
    const since = status.lastBeatAt;
    await raiseControllerSilentAlert({
      siteId: site.id,
      message: "Cloche's controller is not running, so no plug is being switched by its schedule.",
      detail: since ? { since: since.toISOString(), lastedMin: Math.floor((now.getTime() - since.getTime()) / 60_000) } : {},
      at: now,
    });
    return "raised" as const;
  }
  if (!silent && status.running && open) {
    await clearControllerSilentAlert({
      siteId: site.id,
      alertId: open.id,
      clearedMessage: `The controller is running again (heard at ${localTime(status.lastBeatAt ?? now, site.zone)}); plugs follow their schedules.`,
      at: now,
    });
    return "cleared" as const;
  }
  return null;
}
