// The bench's devices, in a process of their own as real devices would be: 1,000
// simulated plugs on the controller's broker, one more plug on a site the controller
// does not run (the broker's own round trip), and 1,000 bare subscribers on a bare
// broker (its fan-out; asked to, each answers with a retained QoS 1 message of its own,
// the least traffic a schedule edge makes). Driven by the bench over IPC.
import mqtt, { type MqttClient } from "mqtt";
import { startPlugDevice, type PlugDevice } from "../../fakes/plug-device";
import { setNoDelay } from "../../fakes/connect";

export type FleetRequest =
  | { kind: "plugs"; url: string; site: string; plugs: { device: string; password: string }[] }
  | { kind: "subscribers"; url: string; topic: string; count: number }
  | { kind: "cpu" }
  | { kind: "stop" };

export type FleetReply =
  | { kind: "ready"; what: "plugs" | "subscribers" }
  | { kind: "fanned-out"; round: number; firstAt: number; lastAt: number }
  | { kind: "cpu"; micros: number }
  | { kind: "error"; message: string };

/** Epoch ms with sub-millisecond precision, comparable across the two processes. */
export const clock = () => performance.timeOrigin + performance.now();

const send = (reply: FleetReply) => process.send!(reply);
const plugs: PlugDevice[] = [];
const subscribers: MqttClient[] = [];

async function startPlugs(request: Extract<FleetRequest, { kind: "plugs" }>) {
  for (let i = 0; i < request.plugs.length; i += 50) {
    const batch = request.plugs.slice(i, i + 50);
    plugs.push(
      ...(await Promise.all(
        batch.map((p) =>
          startPlugDevice({ url: request.url, site: request.site, device: p.device, password: p.password, ratedW: 1000, tickMs: 1000, reportEveryMs: 0 }),
        ),
      )),
    );
  }
  send({ kind: "ready", what: "plugs" });
}

async function startSubscribers(request: Extract<FleetRequest, { kind: "subscribers" }>) {
  const received = new Map<number, { n: number; firstAt: number; lastAt: number }>();
  for (let i = 0; i < request.count; i += 50) {
    const batch = await Promise.all(
      Array.from({ length: Math.min(50, request.count - i) }, async (_, k) => {
        const client = await mqtt.connectAsync(request.url, { protocolVersion: 4, clientId: `fanout-${i + k}`, reconnectPeriod: 0 });
        setNoDelay(client);
        client.on("message", (_topic, payload) => {
          const at = clock();
          const { round, answer } = JSON.parse(payload.toString()) as { round: number; answer?: boolean };
          if (answer) client.publish(`${request.topic}/answer/${i + k}`, payload, { qos: 1, retain: true });
          const r = received.get(round) ?? { n: 0, firstAt: at, lastAt: at };
          r.n++;
          r.lastAt = at;
          received.set(round, r);
          if (r.n === request.count) send({ kind: "fanned-out", round, firstAt: r.firstAt, lastAt: r.lastAt });
        });
        await client.subscribeAsync(request.topic, { qos: 1 });
        return client;
      }),
    );
    subscribers.push(...batch);
  }
  send({ kind: "ready", what: "subscribers" });
}

process.on("message", (request: FleetRequest) => {
  const run = async () => {
    if (request.kind === "plugs") await startPlugs(request);
    else if (request.kind === "subscribers") await startSubscribers(request);
    else if (request.kind === "cpu") {
      const used = process.cpuUsage();
      send({ kind: "cpu", micros: used.user + used.system });
    }
    else {
      await Promise.all([...plugs.map((p) => p.close()), ...subscribers.map((s) => s.endAsync())]);
      process.exit(0);
    }
  };
  run().catch((error: unknown) => send({ kind: "error", message: error instanceof Error ? error.message : String(error) }));
});
process.on("disconnect", () => process.exit(0));
