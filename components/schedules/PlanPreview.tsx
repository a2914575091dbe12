"use client";

import { useEffect, useState } from "react";
import useSWR from "swr";
import { Notice } from "@/components/ui/Notice";
import { Select } from "@/components/ui/Select";
import { useTemperatureUnit } from "@/components/site/TemperatureUnit";
import { PREVIEW_HOURS, type PlanInput } from "@/lib/schemas/schedule";
import { describeRule } from "@/lib/schedules/format";
import { localParts, segmentsByLocalDay } from "@/lib/schedules/local-days";
import type { Preview } from "@/lib/schedules/preview";
import { WINDOW_TONES } from "./window-tone";
import { postJson } from "./api";

type Props = { siteId: string; plugId: string; plan: PlanInput; valid: boolean; timeZone: string };

const HOURS_LABELS: Record<(typeof PREVIEW_HOURS)[number], string> = { 24: "Next 24 hours", 48: "Next 2 days", 72: "Next 3 days", 168: "Next 7 days" };

/** Waits until the value has stopped changing for `ms`. */
function useSettled<T>(value: T, ms: number): T {
  const [settled, setSettled] = useState(value);
  useEffect(() => {
    const t = setTimeout(() => setSettled(value), ms);
    return () => clearTimeout(t);
  }, [value, ms]);
  return settled;
}

/**
 * What the plug would follow over the coming hours under the plan as it stands in the
 * editor, saved or not, worked out on the server by the controller's own rules.
 */
export function PlanPreview({ siteId, plugId, plan, valid, timeZone }: Props) {
  const unit = useTemperatureUnit();
  const [hours, setHours] = useState<(typeof PREVIEW_HOURS)[number]>(24);
  const draft = useSettled(JSON.stringify(plan), 400);
  const { data, error, isLoading } = useSWR<Preview>(
    valid ? [`/api/sites/${siteId}/plugs/${plugId}/schedule/preview`, hours, draft] : null,
    ([url, h, body]: [string, number, string]) => postJson<Preview>(url, { hours: h, plan: JSON.parse(body) as PlanInput }),
    { keepPreviousData: true, revalidateOnFocus: false },
  );
  const rows = data ? segmentsByLocalDay(data.segments, timeZone) : [];

  return (
    <section aria-labelledby="preview-title" className="flex flex-col gap-3">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h2 id="preview-title" className="text-lg font-semibold text-frost-950">
            Preview
          </h2>
          <p className="text-sm text-frost-600">What the plug would be allowed to do under this plan, before you save it. Overrides in force are included.</p>
        </div>
        <label className="flex flex-col gap-1 text-sm font-medium text-frost-900">
          Show
          <Select value={hours} onChange={(e) => setHours(Number(e.target.value) as typeof hours)} className="w-auto">
            {PREVIEW_HOURS.map((h) => (
              <option key={h} value={h}>
                {HOURS_LABELS[h]}
              </option>
            ))}
          </Select>
        </label>
      </div>

      {!valid ? <Notice tone="caution">Fix the problems marked in the plan to see its preview.</Notice> : null}
      {error ? <Notice tone="error">{(error as Error).message}</Notice> : null}
      {valid && isLoading && !data ? <p className="text-sm text-frost-600">Working out the preview…</p> : null}

      {data?.clockChanges.map((c) => (
        <Notice key={c.date} tone="info">
          <strong>{localParts(`${c.date}T12:00:00Z`, "UTC").dayLabel}: the clocks go {c.hours < 24 ? "forward" : "back"} an hour</strong>, so the day has {c.hours} hours.
          Windows keep their local times: one that opens at 18:00 still opens at 18:00.{" "}
          {c.hours < 24
            ? "A window that starts in the skipped hour opens when the clocks have gone forward; one that spans the change is an hour shorter."
            : "A time that happens twice counts at its first occurrence; a window that spans the change is an hour longer."}
        </Notice>
      ))}

      {data ? (
        <div className={`flex flex-col gap-2 ${isLoading ? "opacity-70" : ""}`} aria-busy={isLoading}>
          <div aria-hidden className="flex flex-col gap-1.5">
            {rows.map((r) => (
              <div key={r.date} className="grid grid-cols-[5.5rem_1fr] items-center gap-2">
                <span className="text-xs font-medium text-frost-700">{r.label}</span>
                <div className="relative h-8 rounded-md bg-frost-100">
                  {r.pieces.map((p, i) => {
                    const d = describeRule(data.segments[p.segment]!.rule, unit);
                    return (
                      <span
                        key={i}
                        title={d.label}
                        className={`absolute inset-y-0 overflow-hidden border-l-2 px-1 text-[11px] leading-8 whitespace-nowrap ${WINDOW_TONES[d.tone]}`}
                        style={{ left: `${(p.from / 1440) * 100}%`, width: `${((p.until - p.from) / 1440) * 100}%` }}
                      >
                        {d.label}
                      </span>
                    );
                  })}
                </div>
              </div>
            ))}
            <div className="grid grid-cols-[5.5rem_1fr] text-[11px] text-frost-600">
              <span />
              <span className="flex justify-between">
                <span>00:00</span>
                <span>06:00</span>
                <span>12:00</span>
                <span>18:00</span>
                <span>24:00</span>
              </span>
            </div>
          </div>
          <ol className="divide-y divide-frost-100 rounded-card border border-frost-200 bg-white text-sm" aria-label="Preview, change by change">
            {data.segments.map((s, i) => {
              const a = localParts(s.from, timeZone);
              const b = localParts(s.until, timeZone);
              const d = describeRule(s.rule, unit);
              return (
                <li key={i} className="flex flex-wrap gap-x-3 px-3 py-2">
                  <span className="w-44 shrink-0 font-medium tabular-nums text-frost-900">
                    {a.dayLabel} {a.time} – {b.date === a.date ? "" : `${b.dayLabel} `}
                    {b.time}
                  </span>
                  <span className="font-semibold">{d.label}</span>
                  <span className="text-frost-600">{d.detail}</span>
                </li>
              );
            })}
          </ol>
        </div>
      ) : null}
    </section>
  );
}
