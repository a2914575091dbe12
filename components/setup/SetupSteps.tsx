import Link from "next/link";
import { buttonClasses } from "@/components/ui/Button";

export type SetupProgress = {
  house: { id: string; name: string } | null;
  /** The house's first plug and sensor, when it has them. */
  plug: { id: string; name: string } | null;
  sensor: { id: string; name: string } | null;
  /** Both have a credential issued. */
  credentials: boolean;
};

type Step = { title: string; detail: string; href: string | null; action: string; done: boolean };

function stepsOf(slug: string, p: SetupProgress): Step[] {
  const base = `/sites/${slug}`;
  const houseQuery = p.house ? `?house=${p.house.id}` : "";
  return [
    { title: "Add a house", detail: "Its size, glazing and its low and high safety limits.", href: `${base}/houses/new`, action: "Add a house", done: Boolean(p.house) },
    {
      title: "Add its heater plug",
      detail: "The smart plug the heater hangs off, with the heater’s watts and the plug’s rating.",
      href: p.house ? `${base}/devices/plugs/new${houseQuery}` : null,
      action: "Add a plug",
      done: Boolean(p.plug),
    },
    {
      title: "Add its sensor",
      detail: "The thermometer whose readings the heater’s band follows.",
      href: p.house ? `${base}/devices/sensors/new${houseQuery}` : null,
      action: "Add a sensor",
      done: Boolean(p.sensor),
    },
    {
      title: "Connect the devices",
      detail: "Issue each device its credential and set it up with the connection details.",
      href: p.plug ? `${base}/devices/plug/${p.plug.id}` : p.sensor ? `${base}/devices/sensor/${p.sensor.id}` : null,
      action: "Credentials and connection details",
      done: p.credentials,
    },
  ];
}

/** The short path from an empty site to a working house; the next step is offered as a button. */
export function SetupSteps({ slug, progress, canManage }: { slug: string; progress: SetupProgress; canManage: boolean }) {
  const steps = stepsOf(slug, progress);
  const next = steps.findIndex((s) => !s.done);
  return (
    <ol className="flex flex-col gap-3">
      {steps.map((step, i) => {
        const state = step.done ? "done" : i === next ? "next" : "later";
        return (
          <li
            key={step.title}
            className={`flex flex-col gap-2 rounded-lg border p-4 sm:flex-row sm:items-center sm:justify-between ${
              state === "next" ? "border-leaf-300 bg-leaf-50" : "border-frost-200 bg-white"
            }`}
            aria-current={state === "next" ? "step" : undefined}
          >
            <div className="flex items-start gap-3">
              <span
                aria-hidden="true"
                className={`mt-0.5 flex size-7 shrink-0 items-center justify-center rounded-full text-sm font-semibold ${
                  step.done ? "bg-leaf-700 text-white" : state === "next" ? "bg-white text-leaf-800 ring-2 ring-leaf-600" : "bg-frost-100 text-frost-600"
                }`}
              >
                {step.done ? "✓" : i + 1}
              </span>
              <div>
                <p className="font-semibold text-frost-950">
                  {step.title}
                  <span className="sr-only">{step.done ? " (done)" : state === "next" ? " (next)" : ""}</span>
                </p>
                <p className="text-sm text-frost-700">{step.detail}</p>
              </div>
            </div>
            {canManage && state === "next" && step.href ? (
              <Link href={step.href} className={buttonClasses("primary", "shrink-0")}>
                {step.action}
              </Link>
            ) : null}
          </li>
        );
      })}
    </ol>
  );
}
