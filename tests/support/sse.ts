// Reads a text/event-stream body event by event, as a browser's EventSource would.
export type SseEvent = { event: string; data: unknown; at: number };

export function sseReader(body: ReadableStream<Uint8Array>) {
  const reader = body.getReader();
  const decoder = new TextDecoder();
  const queue: SseEvent[] = [];
  const waiters: ((e: SseEvent) => void)[] = [];
  let buffer = "";
  let closed = false;
  void (async () => {
    try {
      for (;;) {
        const { value, done } = await reader.read();
        if (done) break;
        buffer += decoder.decode(value, { stream: true });
        let end: number;
        while ((end = buffer.indexOf("\n\n")) >= 0) {
          const block = buffer.slice(0, end);
          buffer = buffer.slice(end + 2);
          const event = /^event: (.*)$/m.exec(block)?.[1];
          const data = /^data: (.*)$/m.exec(block)?.[1];
          if (!event || data === undefined) continue;
          const e = { event, data: JSON.parse(data) as unknown, at: performance.now() };
          const waiter = waiters.shift();
          if (waiter) waiter(e);
          else queue.push(e);
        }
      }
    } catch {
      // cancelled
    } finally {
      closed = true;
    }
  })();
  return {
    /** The next event (optionally the next one passing `accept`), or a timeout error. */
    async next(accept: (e: SseEvent) => boolean = () => true, ms = 5000): Promise<SseEvent> {
      const deadline = Date.now() + ms;
      for (;;) {
        const i = queue.findIndex(accept);
        if (i >= 0) return queue.splice(0, i + 1).at(-1)!;
        queue.length = 0;
        const left = deadline - Date.now();
        if (left <= 0 || closed) throw new Error(closed ? "the stream closed" : "no such event in time");
        const e = await new Promise<SseEvent | null>((resolve) => {
          const waiter = (got: SseEvent) => {
            clearTimeout(timer);
            resolve(got);
          };
          const timer = setTimeout(() => {
            waiters.splice(waiters.indexOf(waiter), 1);
            resolve(null);
          }, left);
          waiters.push(waiter);
        });
        if (e && accept(e)) return e;
      }
    },
    cancel: () => reader.cancel(),
    get closed() {
      return closed;
    },
  };
}
