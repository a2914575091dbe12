import type { TariffKind } from "@/lib/domain";
import { clockText, describeDayRow, tariffWeek, type DraftRate } from "@/lib/tariffs/week";
import { DOUBLED_TONE, GAP_TONE, rateTone } from "./rate-tones";

const pct = (min: number) => `${(min / 1440) * 100}%`;

/**
 * A tariff's week: one bar per day, midnight to midnight, coloured by the rate in
 * force, with stretches no rate covers and stretches two rates claim marked. The same
 * reading in words follows for screen readers and anyone who prefers text.
 */
export function TariffWeek({ kind, rates }: { kind: TariffKind; rates: readonly DraftRate[] }) {
  const rows = tariffWeek(kind, rates);
  const labels = rates.map((r, i) => r.label.trim() || `Rate ${i + 1}`);
  const anyGap = rows.some((r) => r.pieces.some((p) => p.rate === null));
  const anyDoubled = rows.some((r) => r.doubled.length > 0);
  return (
    <figure className="flex flex-col gap-3">
      <div aria-hidden="true" className="flex flex-col gap-1.5">
        <div className="ml-11 flex justify-between text-xs text-frost-600">
          {[0, 6, 12, 18, 24].map((h) => (
            <span key={h}>{String(h).padStart(2, "0")}</span>
          ))}
        </div>
        {rows.map((row) => (
          <div key={row.day} className="flex items-center gap-2">
            <span className="w-9 text-xs font-medium text-frost-800">{row.name.slice(0, 3)}</span>
            <div className="relative h-6 flex-1 overflow-hidden rounded-md bg-frost-100">
              {row.pieces.map((p) => (
                <div
                  key={p.fromMin}
                  title={`${p.rate === null ? "No rate" : labels[p.rate]} ${clockText(p.fromMin)}–${clockText(p.toMin)}`}
                  className={`absolute inset-y-0 ${p.rate === null ? GAP_TONE : rateTone(p.rate)}`}
                  style={{ left: pct(p.fromMin), width: pct(p.toMin - p.fromMin) }}
                />
              ))}
              {row.doubled.map((d) => (
                <div key={`d${d.fromMin}`} className={`absolute inset-x-auto bottom-0 h-2 ${DOUBLED_TONE}`} style={{ left: pct(d.fromMin), width: pct(d.toMin - d.fromMin) }} />
              ))}
              {[6, 12, 18].map((h) => (
                <div key={h} className="absolute inset-y-0 w-px bg-white/70" style={{ left: pct(h * 60) }} />
              ))}
            </div>
          </div>
        ))}
      </div>
      <ul className="flex flex-wrap gap-x-4 gap-y-1.5 text-sm text-frost-800" aria-label="Legend">
        {labels.map((label, i) => (
          <li key={i} className="flex items-center gap-1.5">
            <span aria-hidden="true" className={`inline-block size-4 rounded-sm ${rateTone(i)}`} />
            {label}
          </li>
        ))}
        {anyGap ? (
          <li className="flex items-center gap-1.5">
            <span aria-hidden="true" className={`inline-block size-4 rounded-sm ${GAP_TONE}`} />
            No rate
          </li>
        ) : null}
        {anyDoubled ? (
          <li className="flex items-center gap-1.5">
            <span aria-hidden="true" className={`inline-block h-2 w-4 rounded-sm ${DOUBLED_TONE}`} />
            Two rates at once
          </li>
        ) : null}
      </ul>
      <details className="text-sm text-frost-800">
        <summary className="flex min-h-11 cursor-pointer items-center font-medium text-leaf-800">The week in words</summary>
        <ul className="mt-1 flex flex-col gap-1">
          {rows.map((row) => (
            <li key={row.day}>
              <span className="font-medium">{row.name}:</span> {describeDayRow(row, labels)}
            </li>
          ))}
        </ul>
      </details>
    </figure>
  );
}
