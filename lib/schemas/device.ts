import { z } from "zod";
import type { DeviceKind } from "@/lib/mqtt/topics";
import { recordId } from "./common";

export const deviceParams = z.object({
  siteId: recordId("site"),
  kind: z.enum(["plug", "sensor"] satisfies DeviceKind[], { error: "kind must be plug or sensor" }),
  id: recordId("device"),
});
