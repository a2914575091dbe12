// The form's validation on the shared schema, in its own chunk: zod is a third of the
// page's JavaScript, and a phone needs it only once someone starts an override.
import { zodResolver } from "@hookform/resolvers/zod";
import { overrideSchema } from "@/lib/schemas/override-input";

export const overrideResolver = zodResolver(overrideSchema);
