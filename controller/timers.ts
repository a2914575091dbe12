// Every timer the controller keeps, so that close() clears them all in one place.
export function createTimers() {
  const intervals = new Set<NodeJS.Timeout>();
  const timeouts = new Map<string, NodeJS.Timeout>();
  let cleared = false;
  return {
    every(ms: number, work: () => void) {
      if (cleared) return;
      intervals.add(setInterval(work, ms));
    },
    /** One timer per name: setting it again replaces the last. */
    at(name: string, delayMs: number, work: () => void) {
      clearTimeout(timeouts.get(name));
      if (cleared) return;
      const timer = setTimeout(() => {
        timeouts.delete(name);
        work();
      }, delayMs);
      timer.unref?.();
      timeouts.set(name, timer);
    },
    pending: (name: string) => timeouts.has(name),
    clearAll() {
      cleared = true;
      for (const timer of intervals) clearInterval(timer);
      for (const timer of timeouts.values()) clearTimeout(timer);
      intervals.clear();
      timeouts.clear();
    },
  };
}

export type Timers = ReturnType<typeof createTimers>;
