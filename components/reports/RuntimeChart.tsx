import type { EnergyReport } from "@/lib/energy/report";
import { HOUSE_COLOURS, dayLabel } from "./format";

const PAD = { left: 40, right: 8, top: 12, bottom: 28 };

/** A tick step that gives about four lines for `max`. */
function step(max: number) {
  const raw = max / 4;
  const p = 10 ** Math.floor(Math.log10(raw || 1));
  return [1, 2, 5, 10].map((m) => m * p).find((s) => s >= raw) ?? p * 10;
}

/**
 * Runtime per day, week or month, stacked by house; drawn on the server, no script.
 * `width` is the drawing's own width: draw a narrow one for phones, so its text stays
 * readable when it is scaled to the screen.
 */
export function RuntimeChart({ report, width: W, id }: { report: EnergyReport; width: number; id: string }) {
  const H = Math.round(W / 3) + 20;
  const { series, houses, bucket } = report;
  const max = Math.max(0, ...series.map((b) => b.onHours));
  const tick = step(max || 1);
  const top = Math.max(tick, Math.ceil(max / tick) * tick);
  const innerW = W - PAD.left - PAD.right;
  const innerH = H - PAD.top - PAD.bottom;
  const slot = innerW / Math.max(1, series.length);
  const bar = Math.max(1, Math.min(40, slot * 0.72));
  const y = (v: number) => PAD.top + innerH - (v / top) * innerH;
  const labelEvery = Math.ceil(series.length / Math.max(3, Math.floor(W / 90)));
  const colour = new Map(houses.map((h, i) => [h.id, HOUSE_COLOURS[i % HOUSE_COLOURS.length]!]));

  return (
    <figure className="flex flex-col gap-2">
      <svg viewBox={`0 0 ${W} ${H}`} role="img" aria-labelledby={`${id}-title`} className="h-auto w-full">
        <title id={`${id}-title`}>{`Runtime by ${bucket}, in hours, stacked by house; the table below has the figures.`}</title>
        {Array.from({ length: Math.round(top / tick) + 1 }, (_, i) => i * tick).map((v) => (
          <g key={v}>
            <line x1={PAD.left} x2={W - PAD.right} y1={y(v)} y2={y(v)} stroke="#d7dde3" strokeWidth={1} />
            <text x={PAD.left - 6} y={y(v) + 4} textAnchor="end" fontSize={12} fill="#495461">
              {v}
            </text>
          </g>
        ))}
        {series.map((b, i) => {
          let stacked = 0;
          const x = PAD.left + i * slot + (slot - bar) / 2;
          return (
            <g key={b.key}>
              {houses.map((h) => {
                const v = b.byHouse[h.id]?.onHours ?? 0;
                if (v <= 0) return null;
                const y0 = y(stacked);
                stacked += v;
                return <rect key={h.id} x={x} y={y(stacked)} width={bar} height={Math.max(0.5, y0 - y(stacked))} fill={colour.get(h.id)} />;
              })}
              {i % labelEvery === 0 && (
                <text x={x + bar / 2} y={H - 8} textAnchor="middle" fontSize={12} fill="#495461">
                  {dayLabel(b.fromDay, { month: bucket === "month" })}
                </text>
              )}
            </g>
          );
        })}
        <text x={4} y={PAD.top + 4} fontSize={12} fill="#495461">
          h
        </text>
      </svg>
      {houses.length > 1 && (
        <figcaption className="flex flex-wrap gap-x-4 gap-y-1 text-sm text-frost-700">
          {houses.map((h) => (
            <span key={h.id} className="inline-flex items-center gap-1.5">
              <span aria-hidden className="inline-block size-3 rounded-sm" style={{ background: colour.get(h.id) }} />
              {h.name}
            </span>
          ))}
        </figcaption>
      )}
    </figure>
  );
}
