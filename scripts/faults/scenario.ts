// One scenario of the fault suite (`npm run faults`): it does something bad to the
// running product and reports what happened, in figures, against the targets.
import type { FaultProcesses } from "./processes";

export type FaultContext = {
  /** The web app's base URL, e.g. http://127.0.0.1:3440 */
  url: string;
  /** The broker's URL, e.g. mqtt://127.0.0.1:1940 */
  mqttUrl: string;
  /** The app user's database URL (the demo site is seeded, device secrets issued). */
  databaseUrl: string;
  /** The simulated demo devices' secrets file (JSON, as scripts/demo-devices.ts writes it). */
  deviceSecretsFile: string;
  /** Prints one line of what the scenario is doing. */
  log: (line: string) => void;
  /** The stack's processes (database, services, a plug of its own), for scenarios that freeze or kill them. */
  processes?: FaultProcesses;
  /** `--freeze-seconds N` and the like from the command line, for scenarios that take them. */
  options?: Record<string, number>;
};

/** Figures every scenario reports; null where a figure does not apply to it. */
export type FaultFigures = {
  switchesLost: number | null;
  switchesDoubled: number | null;
  /** The longest time control was not acting as it should (ms). */
  longestControlGapMs: number | null;
  crashes: number | null;
  /** 5xx answers to bad or hostile input. */
  serverErrors: number | null;
};

export type FaultResult = {
  figures: FaultFigures;
  /** Other figures worth printing, e.g. { payloads: 10000, refused: 10000 }. */
  extra?: Record<string, number | string>;
  /** Each target missed, as a sentence; empty when all were met. */
  failures: string[];
};

export type FaultScenario = {
  name: string;
  /** Runs in `npm test` as well as in `npm run faults`. */
  quick: boolean;
  /** One sentence: what it does to the product. */
  about: string;
  run: (context: FaultContext) => Promise<FaultResult>;
};
