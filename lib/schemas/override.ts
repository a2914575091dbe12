import { z } from "zod";
import { recordId } from "./common";

export * from "../override-durations";
// The override's input lives apart, on zod's small build, so the phone page's validation stays light.
export { overrideSchema, type OverrideInput } from "./override-input";

export const plugParams = z.object({ siteId: recordId("site"), plugId: recordId("plug") });
export const overrideParams = plugParams.extend({ overrideId: recordId("override") });

