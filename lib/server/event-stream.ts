import "server-only";

const HEARTBEAT_MS = 15_000;

/** A server-sent event: a name and a JSON payload. */
export type StreamEvent = { event: string; data: unknown };

/**
 * A text/event-stream response that `start` feeds through `send`; what `start` returns
 * is called once the client has gone (or the stream is cancelled). A comment line every
 * 15 s keeps proxies from closing a quiet stream.
 */
export function eventStream(signal: AbortSignal, start: (send: (e: StreamEvent) => void) => () => void): Response {
  const encoder = new TextEncoder();
  let stop: (() => void) | null = null;
  let heartbeat: NodeJS.Timeout | undefined;
  const finish = () => {
    clearInterval(heartbeat);
    stop?.();
    stop = null;
  };
  const body = new ReadableStream<Uint8Array>({
    start(controller) {
      let open = true;
      const write = (text: string) => {
        if (!open) return;
        try {
          controller.enqueue(encoder.encode(text));
        } catch {
          open = false;
          finish();
        }
      };
      stop = start((e) => write(`event: ${e.event}\ndata: ${JSON.stringify(e.data)}\n\n`));
      heartbeat = setInterval(() => write(": still here\n\n"), HEARTBEAT_MS);
      const close = () => {
        if (!open) return;
        open = false;
        finish();
        try {
          controller.close();
        } catch {
          // already closed by the client
        }
      };
      if (signal.aborted) close();
      else signal.addEventListener("abort", close, { once: true });
    },
    cancel() {
      finish();
    },
  });
  return new Response(body, {
    headers: {
      "content-type": "text/event-stream; charset=utf-8",
      "cache-control": "no-cache, no-store, no-transform",
      connection: "keep-alive",
      "x-accel-buffering": "no",
    },
  });
}
