// A TCP proxy to put in front of MariaDB, so a test can take the database away and
// bring it back while the controller runs, or make it hang as a stopped process does.
import net from "node:net";

export type TcpProxy = {
  port: number;
  /** Drops every open connection and refuses new ones (each is reset on arrival). */
  cut: () => void;
  /** Lets the server's requests through but never its replies, then drops the connections:
   *  the server has done the work, the client cannot know it. */
  swallowReplies: () => void;
  /** Passes everything until a client sends a statement matching `marker` (say, a COMMIT), then swallows from there. */
  swallowRepliesFrom: (marker: RegExp) => void;
  /**
   * Hangs like a stopped server (kill -STOP): connections are accepted and whatever is
   * sent is held, nothing is answered and nothing is closed. `restore` lets the held
   * bytes through in order, including those of clients that gave up meanwhile (the
   * server then does that work and finds the client gone, as a real one would).
   */
  freeze: () => void;
  restore: () => void;
  close: () => Promise<void>;
};

export async function startTcpProxy(target: { host: string; port: number }): Promise<TcpProxy> {
  let mode: "pass" | "cut" | "swallow" | "frozen" = "pass";
  let swallowFrom: RegExp | null = null;
  const open = new Set<net.Socket>();
  /** What each connection sent or was sent while frozen, to deliver on restore. */
  const held: { from: net.Socket; to: net.Socket; chunk: Buffer | null }[] = [];

  const server = net.createServer((client) => {
    if (mode === "cut") return void client.destroy();
    const upstream = net.connect(target.port, target.host);
    for (const s of [client, upstream]) {
      open.add(s);
      s.setNoDelay(true);
      s.on("close", () => {
        open.delete(s);
        // Frozen, the hang-up reaches the other side only after what was held.
        if (mode === "frozen") return void held.push({ from: s, to: s === client ? upstream : client, chunk: null });
        client.destroy();
        upstream.destroy();
      });
      s.on("error", () => undefined);
    }
    client.on("data", (chunk) => {
      if (mode === "frozen") return void held.push({ from: client, to: upstream, chunk });
      if (swallowFrom && mode === "pass" && swallowFrom.test(chunk.toString("latin1"))) {
        mode = "swallow";
        swallowFrom = null;
      }
      if (mode !== "cut") upstream.write(chunk);
    });
    upstream.on("data", (chunk) => {
      if (mode === "frozen") return void held.push({ from: upstream, to: client, chunk });
      if (mode === "pass") return void client.write(chunk);
      // Swallowed: give the server a moment to finish the statement, then hang up.
      setTimeout(() => {
        client.destroy();
        upstream.destroy();
      }, 50);
    });
  });
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  const port = (server.address() as net.AddressInfo).port;

  const dropAll = () => {
    for (const s of open) s.destroy();
  };
  return {
    port,
    cut() {
      mode = "cut";
      dropAll();
    },
    swallowReplies() {
      mode = "swallow";
    },
    swallowRepliesFrom(marker) {
      swallowFrom = marker;
    },
    freeze() {
      mode = "frozen";
    },
    restore() {
      mode = "pass";
      swallowFrom = null;
      for (const { to, chunk } of held.splice(0)) {
        if (to.destroyed) continue;
        if (chunk) to.write(chunk);
        else to.end();
      }
    },
    async close() {
      dropAll();
      await new Promise<void>((resolve) => server.close(() => resolve()));
    },
  };
}
