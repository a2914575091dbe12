import type { EnergyReport } from "@/lib/energy/report";
import { HOUSE_COLOURS, reportFormat } from "./format";

/** Each house's energy cost as a bar, with the figure beside it. */
export function CostByHouse({ report, currency }: { report: EnergyReport; currency: string }) {
  const f = reportFormat(currency);
  const max = Math.max(0, ...report.houses.map((h) => h.cost ?? 0));
  return (
    <ul className="flex flex-col gap-3" aria-label="Energy cost by house">
      {report.houses.map((h, i) => (
        <li key={h.id} className="flex flex-col gap-1">
          <div className="flex items-baseline justify-between gap-3 text-sm">
            <span className="font-medium text-frost-900">{h.name}</span>
            <span className="tabular-nums text-frost-800">
              {f.money(h.cost)} <span className="text-frost-600">· {f.kwh(h.costedKwh)}</span>
            </span>
          </div>
          <div className="h-3 rounded-full bg-frost-100" aria-hidden>
            <div
              className="h-3 rounded-full"
              style={{ width: `${max > 0 ? Math.max(1, ((h.cost ?? 0) / max) * 100) : 0}%`, background: HOUSE_COLOURS[i % HOUSE_COLOURS.length] }}
            />
          </div>
        </li>
      ))}
    </ul>
  );
}
