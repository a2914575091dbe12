// Pieces every process-level scenario uses: waiting, the switch account turned into
// figures and failures, and the demo devices' secrets.
import { readDeviceSecrets } from "../../fakes/layout";
import { accountSwitches, journalOf } from "./accounting";
import { loadDemoSite, readSwitchLog } from "./demo";
import type { FaultContext, FaultResult } from "./scenario";
import type { FaultProcesses } from "./processes";

/** The longest back-off of the controller's switch-log writes (controller/switch-log.ts), and a little more. */
const LOG_CATCH_UP_MS = 45_000;

export const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, Math.max(0, ms)));

/** Polls `test` until it gives a value other than undefined/false; undefined after `timeoutMs`. */
export async function waitFor<T>(test: () => Promise<T | undefined | false> | T | undefined | false, timeoutMs: number, everyMs = 20): Promise<T | undefined> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = await test();
    if (value !== undefined && value !== false) return value as T;
    if (Date.now() > deadline) return undefined;
    await sleep(everyMs);
  }
}

export function processesOf(context: FaultContext): FaultProcesses {
  if (!context.processes) throw new Error("this scenario needs the stack's processes (run it through scripts/faults.ts)");
  return context.processes;
}

export async function secretOf(context: FaultContext, username: string) {
  const secret = (await readDeviceSecrets(context.deviceSecretsFile))[username];
  if (!secret) throw new Error(`no secret for ${username} in ${context.deviceSecretsFile}`);
  return secret;
}

/** A window opens on a whole second (its start is stored as HH:MM:SS): the next one from `ms`. */
export const wholeSecond = (ms: number) => Math.ceil(ms / 1000) * 1000;

/** Seconds with one decimal, for the lines a scenario prints. */
export const seconds = (ms: number) => `${(ms / 1000).toFixed(1)} s`;

/**
 * The switch account of [fromMs, now − settle] as figures, with each control gap
 * (device → ms, null when the plug never got there) and the scenario's own failures.
 */
export async function settle(
  context: FaultContext,
  o: { fromMs: number; gaps: Record<string, number | null>; failures: string[]; extra?: Record<string, number | string> },
): Promise<FaultResult> {
  const { journalFile } = processesOf(context);
  const toMs = Date.now();
  // The controller keeps rows it could not write and tries again with back-off (up to
  // 30 s apart): the log is given that long to catch up before a switch counts as lost.
  const account = async () => {
    const journal = journalOf(journalFile);
    // Rows from a little before the stretch let a command sent just before it be matched.
    const logAll = await readSwitchLog(context.databaseUrl, o.fromMs - 10 * 60_000, toMs + 60_000);
    return accountSwitches(journal, logAll, o.fromMs, toMs, logAll);
  };
  let result = await account();
  if (result.lost) {
    context.log(`${result.lost} switch(es) not in the log yet; giving it up to ${seconds(LOG_CATCH_UP_MS)} to catch up…`);
    result = (await waitFor(async () => ((await account()).lost === 0 ? account() : undefined), LOG_CATCH_UP_MS, 2000)) ?? (await account());
    context.log(`the log ${result.lost ? "did not catch up" : "caught up"} ${seconds(Date.now() - toMs)} after the stretch ended`);
  }
  const catchUp = result;
  for (const line of catchUp.findings) context.log(line);
  const failures = [...o.failures];
  if (catchUp.outOfOrder) failures.push(`${catchUp.outOfOrder} switch(es) written out of order`);
  const gapValues = Object.entries(o.gaps);
  for (const [what, ms] of gapValues) {
    if (ms === null) failures.push(`${what}: the plug never reached the wanted state`);
    else context.log(`control gap, ${what}: ${ms} ms`);
  }
  const known = gapValues.map(([, ms]) => ms).filter((ms): ms is number => ms !== null);
  return {
    figures: {
      switchesLost: catchUp.lost,
      switchesDoubled: catchUp.doubled,
      longestControlGapMs: known.length ? Math.max(...known) : null,
      crashes: 0,
      serverErrors: null,
    },
    extra: { "switches made": catchUp.applied, "switches logged": catchUp.logged, "logged only as observed": catchUp.loggedAsObserved, ...o.extra },
    failures,
  };
}

/**
 * The start of a scenario on the plug that runs in a process of its own: the stack's
 * processes, the demo site, that plug and the controller's service, and when it began.
 */
export async function ownPlugScenario(context: FaultContext) {
  const processes = processesOf(context);
  const fromMs = Date.now();
  const site = await loadDemoSite(context.databaseUrl);
  return { processes, fromMs, failures: [] as string[], site, fan: site.plug(processes.plug.device), controller: processes.service("controller") };
}
