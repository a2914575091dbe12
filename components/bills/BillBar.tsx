import { formatKwh } from "@/lib/tariffs/money";

/** Heating's kWh beside the rest of the bill's, as one bar; heating over the bill shows as a bar past the bill's end. */
export function BillBar({ billedKwh, heatingKwh }: { billedKwh: number; heatingKwh: number }) {
  const over = heatingKwh > billedKwh;
  const scale = Math.max(billedKwh, heatingKwh) || 1;
  const heatingPct = (heatingKwh / scale) * 100;
  const billPct = (billedKwh / scale) * 100;
  const share = billedKwh > 0 ? Math.round((heatingKwh / billedKwh) * 100) : null;
  const words = over
    ? `Heating ${formatKwh(heatingKwh)} is more than the bill’s ${formatKwh(billedKwh)}.`
    : `Heating ${formatKwh(heatingKwh)}${share === null ? "" : ` (${share} %)`}, everything else ${formatKwh(billedKwh - heatingKwh)}, of ${formatKwh(billedKwh)} billed.`;
  return (
    <figure className="flex flex-col gap-1.5">
      <div role="img" aria-label={words} className="relative h-7 overflow-hidden rounded-md bg-frost-200">
        {over ? (
          <>
            <div className="absolute inset-y-0 left-0 bg-ember-500" style={{ width: `${heatingPct}%` }} />
            <div className="absolute inset-y-0 w-0.5 bg-frost-950" style={{ left: `calc(${billPct}% - 1px)` }} />
          </>
        ) : (
          <div className="absolute inset-y-0 left-0 bg-soil-500" style={{ width: `${heatingPct}%` }} />
        )}
      </div>
      <figcaption className="flex flex-wrap gap-x-4 gap-y-1 text-xs text-frost-700">
        <span className="flex items-center gap-1.5">
          <span aria-hidden="true" className={`inline-block size-3 rounded-sm ${over ? "bg-ember-500" : "bg-soil-500"}`} />
          {over ? "Heating, more than the bill" : `Heating${share === null ? "" : ` ${share} %`}`}
        </span>
        {over ? (
          <span className="flex items-center gap-1.5">
            <span aria-hidden="true" className="inline-block h-3 w-0.5 bg-frost-950" />
            The bill’s kWh
          </span>
        ) : (
          <span className="flex items-center gap-1.5">
            <span aria-hidden="true" className="inline-block size-3 rounded-sm bg-frost-200 ring-1 ring-frost-300" />
            Everything else
          </span>
        )}
      </figcaption>
    </figure>
  );
}
