// Watches the controller from outside through its heartbeat row: a crash shows as the
// beats stopping or a new instance taking over (the supervisor restarts a dead one).
import { controllerBeat, type Db } from "./db";

export type ControllerWatch = {
  /** Stops watching; the figures of the whole watch. */
  stop: () => Promise<{ crashes: number; instances: number; longestBeatGapMs: number; beating: boolean }>;
};

const HEARTBEAT_MS = 5000;

export async function watchController(db: Db): Promise<ControllerWatch> {
  const first = await controllerBeat(db);
  if (!first) throw new Error("no controller is beating: is the product running?");
  const instances = new Set([first.instanceId]);
  let lastBeatMs = first.beatAt.getTime();
  let lastChangeSeenMs = Date.now();
  let longestGapMs = 0;
  let stopped = false;
  const sample = async () => {
    const beat = await controllerBeat(db).catch(() => null);
    const nowMs = Date.now();
    if (beat && beat.beatAt.getTime() !== lastBeatMs) {
      instances.add(beat.instanceId);
      lastBeatMs = beat.beatAt.getTime();
      lastChangeSeenMs = nowMs;
    }
    longestGapMs = Math.max(longestGapMs, nowMs - lastChangeSeenMs);
  };
  const loop = (async () => {
    while (!stopped) {
      await sample();
      await new Promise((resolve) => setTimeout(resolve, 1000));
    }
  })();
  return {
    stop: async () => {
      // One more beat must come after the work: a controller that died at the end counts too.
      const until = Date.now() + HEARTBEAT_MS * 2 + 1000;
      const before = lastBeatMs;
      while (Date.now() < until && lastBeatMs === before) {
        await sample();
        await new Promise((resolve) => setTimeout(resolve, 500));
      }
      stopped = true;
      await loop;
      const beating = lastBeatMs !== before;
      return { crashes: instances.size - 1 + (beating ? 0 : 1), instances: instances.size, longestBeatGapMs: longestGapMs, beating };
    },
  };
}
