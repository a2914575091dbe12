// Every scenario of the fault suite, in the order `npm run faults` runs them.
import type { FaultScenario } from "../scenario";
import { brokerRestart } from "./broker-restart";
import { controllerKill } from "./controller-kill";
import { databaseOutage } from "./database-outage";
import { malformedPayloads } from "./malformed-payloads";
import { overridesAtOnce } from "./overrides-at-once";
import { plugPower } from "./plug-power";
import { secondSiteMember } from "./second-site-member";
import { sensorSilentAndClockOff } from "./sensor-silent-and-clock-off";
import { staleReports } from "./stale-reports";

export const scenarios: FaultScenario[] = [
  databaseOutage({ name: "database-frozen-briefly", quick: true, outage: "freeze", seconds: 15, option: "brief-freeze-seconds" }),
  controllerKill,
  databaseOutage({ name: "database-frozen", quick: false, outage: "freeze", seconds: 120, option: "freeze-seconds" }),
  databaseOutage({ name: "database-killed", quick: false, outage: "kill", seconds: 20, option: "down-seconds" }),
  brokerRestart,
  plugPower,
  malformedPayloads,
  staleReports,
  secondSiteMember,
  sensorSilentAndClockOff,
  overridesAtOnce,
];
