// 1,000 overrides at once through the web app, as the grower and the helper, spread
// over the demo's plugs with 50 in flight, and a few bad ones among them. Every answer
// must be a 2xx or a clear 4xx; afterwards each plug must be in the state of its
// override in force, and the switch log must hold no switch twice.
import type { FaultContext, FaultResult, FaultScenario } from "../scenario";
import { watchController } from "../support/controller-watch";
import { doubledCommands, lastSwitchId, loadSite, openDb, plugStates, repeatedSwitches, switchesAfter, type Db } from "../support/db";
import { waitFor } from "../support/devices";
import { call, countBy, inParallel, signIn, statusWords, timeSpread, type Answer, type Session } from "../support/http";

const TOTAL = 1000;
const IN_FLIGHT = 50;
/** One in twenty is bad input, which must get a 400 and change nothing. */
const BAD_EVERY = 20;
const PEOPLE = [
  { email: "grower@fernhollow.example", password: "fernhollow-grower" },
  { email: "helper@fernhollow.example", password: "fernhollow-helper" },
];
const DURATIONS = ["30m", "1h", "3h"] as const;
const BAD_BODIES: unknown[] = [
  { on: "yes", duration: "1h" },
  { on: true, duration: "forever" },
  { on: true, duration: "until", until: "tomorrow" },
  { on: true, duration: "1h", reason: "x".repeat(5000) },
  "{not json",
  { on: 1, duration: 30 },
  [],
];

type Sent = { plugId: string; bad: boolean; answer: Answer | null; error?: string };

async function inForce(db: Db, plugIds: string[]) {
  const [rows] = await db.query(
    `SELECT id, plug_id AS plugId, \`on\`, starts_at AS startsAt FROM overrides
      WHERE plug_id IN (?) AND cancelled_at IS NULL AND (ends_at IS NULL OR ends_at > ?) AND reason LIKE 'Fault suite %'
      ORDER BY starts_at, created_at`,
    [plugIds, new Date()],
  );
  const byPlug = new Map<string, { id: string; on: boolean; startsAt: Date }[]>();
  for (const r of rows as { id: string; plugId: string; on: number; startsAt: Date }[]) {
    byPlug.set(r.plugId, [...(byPlug.get(r.plugId) ?? []), { id: r.id, on: Boolean(r.on), startsAt: r.startsAt }]);
  }
  return byPlug;
}

async function run(context: FaultContext): Promise<FaultResult> {
  const failures: string[] = [];
  const db = openDb(context.databaseUrl);
  const demo = await loadSite(db);
  const plugIds = demo.plugs.map((p) => p.id);
  const sessions: Session[] = [];
  for (const person of PEOPLE) sessions.push(await signIn(context.url, person.email, person.password));
  const firstId = await lastSwitchId(db);
  const watch = await watchController(db);
  context.log(`${TOTAL} override presses over ${plugIds.length} plugs as ${PEOPLE.length} people, ${IN_FLIGHT} in flight, every ${BAD_EVERY}th one bad`);

  const started = Date.now();
  const sent = await inParallel(Array.from({ length: TOTAL }, (_, i) => i), IN_FLIGHT, async (i): Promise<Sent> => {
    const plugId = plugIds[i % plugIds.length]!;
    const bad = i % BAD_EVERY === BAD_EVERY - 1;
    const body = bad
      ? BAD_BODIES[i % BAD_BODIES.length]
      : { on: (i * 7919) % 3 !== 0, duration: DURATIONS[i % DURATIONS.length], reason: `Fault suite press ${i}` };
    try {
      return { plugId, bad, answer: await call(context.url, sessions[i % sessions.length]!, "POST", `/api/sites/${demo.id}/plugs/${plugId}/overrides`, body) };
    } catch (error) {
      return { plugId, bad, answer: null, error: error instanceof Error ? error.message : String(error) };
    }
  });
  const sendMs = Date.now() - started;
  const answered = sent.filter((s) => s.answer);
  const statuses = countBy(sent, (s) => (s.answer ? String(s.answer.status) : "no answer"));
  const times = timeSpread(answered.map((s) => s.answer!.ms));
  context.log(`answered in ${(sendMs / 1000).toFixed(1)} s: ${statusWords(statuses)}; p50 ${times.p50} ms, p95 ${times.p95} ms, max ${times.max} ms`);

  const serverErrors = answered.filter((s) => s.answer!.status >= 500).length;
  if (serverErrors) failures.push(`${serverErrors} answers were 5xx`);
  const noAnswer = sent.length - answered.length;
  if (noAnswer) failures.push(`${noAnswer} presses got no answer (${sent.find((s) => !s.answer)?.error})`);
  const unclear = answered.filter((s) => {
    const { status, json } = s.answer!;
    if (status < 400 || status >= 500) return false;
    const message = (json as { error?: { message?: unknown } } | null)?.error?.message;
    return typeof message !== "string" || message.length < 5;
  });
  if (unclear.length) failures.push(`${unclear.length} 4xx answers carry no message`);
  const goodRefused = answered.filter((s) => !s.bad && s.answer!.status >= 400 && ![409, 429].includes(s.answer!.status));
  if (goodRefused.length) failures.push(`${goodRefused.length} good presses were refused with ${statusWords(countBy(goodRefused, (s) => String(s.answer!.status)))}`);
  const badAccepted = answered.filter((s) => s.bad && s.answer!.status < 400);
  if (badAccepted.length) failures.push(`${badAccepted.length} bad presses were accepted`);

  // Each plug ends in the state of its override in force (the latest started), once the
  // anti-short-cycle guard lets it.
  const forced = await inForce(db, plugIds);
  const twoInForce = [...forced.values()].filter((list) => list.length > 1).length;
  if (twoInForce) failures.push(`${twoInForce} plugs were left with more than one override in force`);
  const wanted = new Map([...forced].map(([plugId, list]) => [plugId, list.at(-1)!]));
  // A change may be held back by the anti-short-cycle guard for up to the plug's least time on or off.
  const [guards] = await db.query("SELECT MAX(GREATEST(min_on_s, min_off_s)) AS s FROM plugs WHERE id IN (?)", [plugIds]);
  const guardMs = Number((guards as { s: number | null }[])[0]?.s ?? 0) * 1000;
  context.log(`waiting up to ${Math.round((guardMs + 20_000) / 1000)} s for every plug to reach its override's state`);
  const settled = await waitFor(async () => {
    const now = await plugStates(db, plugIds);
    return [...wanted].every(([plugId, o]) => now.get(plugId)?.on === o.on) ? now : null;
  }, Math.min(guardMs + 20_000, 300_000), 1000);
  const settledMs = Date.now() - started - sendMs;
  const finalStates = settled ?? (await plugStates(db, plugIds));
  const wrong = [...wanted].filter(([plugId, o]) => finalStates.get(plugId)?.on !== o.on);
  for (const [plugId, o] of wrong) {
    const name = demo.plugs.find((p) => p.id === plugId)?.name;
    failures.push(`${name} is ${String(finalStates.get(plugId)?.on)}, its override in force says ${o.on ? "on" : "off"}`);
  }

  const rows = await switchesAfter(db, plugIds, firstId);
  const doubledIds = doubledCommands(rows);
  const repeated = repeatedSwitches(rows);
  const keptPerOverride = countBy(rows.filter((r) => r.overrideId && !r.withdrawnAt), (r) => r.overrideId!);
  const appliedTwice = Object.values(keptPerOverride).filter((n) => n > 1).length;
  if (doubledIds.length) failures.push(`command ids logged twice: ${doubledIds.slice(0, 5).join(", ")}`);
  if (repeated.length) failures.push(`${repeated.length} switches to a state the plug was already in`);
  if (appliedTwice) failures.push(`${appliedTwice} overrides were applied by more than one kept switch`);

  // The demo goes back to its schedules: the scenario's overrides in force are cancelled.
  let cancelled = 0;
  for (const [plugId, o] of wanted) {
    const answer = await call(context.url, sessions[0]!, "DELETE", `/api/sites/${demo.id}/plugs/${plugId}/overrides/${o.id}`);
    if (answer.status < 300) cancelled++;
    else context.log(`could not cancel override ${o.id}: ${answer.status} ${answer.text.slice(0, 120)}`);
  }
  const watched = await watch.stop();
  if (watched.crashes) failures.push("the controller stopped or restarted during the scenario");
  await db.end();
  return {
    figures: {
      switchesLost: wrong.length,
      switchesDoubled: doubledIds.length + repeated.length + appliedTwice,
      longestControlGapMs: settled ? settledMs : null,
      crashes: watched.crashes,
      serverErrors,
    },
    extra: {
      presses: TOTAL,
      statuses: statusWords(statuses),
      p50Ms: times.p50,
      p95Ms: times.p95,
      maxMs: times.max,
      sendSeconds: Number((sendMs / 1000).toFixed(1)),
      switchesLogged: rows.length,
      withdrawn: rows.filter((r) => r.withdrawnAt).length,
      plugsWithTwoInForce: twoInForce,
      cancelledAfter: cancelled,
    },
    failures,
  };
}

export const overridesAtOnce: FaultScenario = {
  name: "overrides-at-once",
  quick: false,
  about: "1,000 override presses through the web app at once (50 in flight, grower and helper, 1 in 20 bad); no 5xx, each plug ends as its override in force says, no switch logged twice",
  run,
};
