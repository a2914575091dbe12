// Whether control is happening: the controller writes its heartbeat every 5 s; after
// four missed beats it is taken as not running, so a busy moment or a slow database
// write is not mistaken for a dead controller.

/** A controller whose last beat is older than this is not running. */
export const CONTROLLER_SILENT_AFTER_MS = 20_000;

/** True when a controller beat within the last `CONTROLLER_SILENT_AFTER_MS` before `now`. */
export function isControllerRunning(lastBeatAt: Date | null, now: Date): boolean {
  return lastBeatAt !== null && now.getTime() - lastBeatAt.getTime() <= CONTROLLER_SILENT_AFTER_MS;
}
