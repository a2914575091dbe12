"use client";

import { Temperature } from "@/components/site/TemperatureUnit";
import { Notice } from "@/components/ui/Notice";
import type { PreviewRow, RowProblem } from "@/lib/readings-import/parse";

export type PreviewResult = {
  fileName: string;
  rows: number;
  good: number;
  bad: number;
  problems: RowProblem[];
  preview: PreviewRow[];
  minutes: number;
  newMinutes: number;
  minutesAlreadyThere: number;
  firstAt: number | null;
  lastAt: number | null;
  note: string | null;
};

const count = (n: number) => n.toLocaleString("en-GB");

/** What the import would do: counts, the first rows as read, and every bad row by line. */
export function ImportPreview({ preview, siteZone }: { preview: PreviewResult; siteZone: string }) {
  const when = new Intl.DateTimeFormat("en-GB", { timeZone: siteZone, day: "numeric", month: "short", year: "numeric", hour: "2-digit", minute: "2-digit", second: "2-digit" });
  const figures: [string, string][] = [
    ["Rows read", count(preview.rows)],
    ["Good", count(preview.good)],
    ["Need fixing", count(preview.bad)],
    ["New minutes", count(preview.newMinutes)],
    ["Already stored", count(preview.minutesAlreadyThere)],
  ];
  return (
    <section className="flex flex-col gap-4" aria-labelledby="import-preview">
      <h2 id="import-preview" className="text-lg font-semibold text-frost-950">
        Preview of {preview.fileName}
      </h2>
      <dl className="grid grid-cols-2 gap-2 sm:grid-cols-5">
        {figures.map(([label, value]) => (
          <div key={label} className={`rounded-lg border px-3 py-2 ${label === "Need fixing" && preview.bad ? "border-ember-200 bg-ember-50" : "border-frost-200 bg-white"}`}>
            <dt className="text-xs text-frost-600">{label}</dt>
            <dd className="text-lg font-semibold text-frost-950">{value}</dd>
          </div>
        ))}
      </dl>
      {preview.firstAt !== null && preview.lastAt !== null ? (
        <p className="text-sm text-frost-700">
          From {when.format(preview.firstAt)} to {when.format(preview.lastAt)} ({siteZone}). Minutes the sensor already has, heard live or imported before, stay as they are.
        </p>
      ) : null}
      {preview.note ? <Notice tone="caution">{preview.note}</Notice> : null}

      {preview.bad ? (
        <Notice tone="error">
          <p className="font-semibold">
            {count(preview.bad)} {preview.bad === 1 ? "row needs" : "rows need"} fixing. Nothing is imported until every row reads: correct or remove {preview.bad === 1 ? "it" : "them"} in the file, choose it again and check it.
          </p>
          <ul className="mt-1 list-disc pl-5">
            {preview.problems.map((p) => (
              <li key={p.line}>
                Line {p.line}: {p.message}
              </li>
            ))}
          </ul>
          {preview.bad > preview.problems.length ? <p className="mt-1">…and {count(preview.bad - preview.problems.length)} more.</p> : null}
        </Notice>
      ) : null}

      <div className="overflow-x-auto rounded-card border border-frost-200 bg-white">
        <table className="w-full text-left text-sm">
          <caption className="px-3 py-2 text-left text-sm font-medium text-frost-900">The first rows as read</caption>
          <thead className="bg-frost-100 text-frost-700">
            <tr>
              <th scope="col" className="px-3 py-2 font-medium">
                Line
              </th>
              <th scope="col" className="px-3 py-2 font-medium">
                Time in the file
              </th>
              <th scope="col" className="px-3 py-2 font-medium">
                Read as ({siteZone})
              </th>
              <th scope="col" className="px-3 py-2 font-medium">
                Temperature
              </th>
              <th scope="col" className="px-3 py-2 font-medium">
                Humidity
              </th>
            </tr>
          </thead>
          <tbody>
            {preview.preview.map((row) => (
              <tr key={row.line} className={`border-t border-frost-100 ${row.problem ? "bg-ember-50" : ""}`}>
                <td className="px-3 py-2 tabular-nums">{row.line}</td>
                <td className="px-3 py-2 font-mono text-xs">{row.time}</td>
                <td className="px-3 py-2">{row.problem ? <span className="text-ember-800">{row.problem}</span> : row.at !== null ? when.format(row.at) : "—"}</td>
                <td className="px-3 py-2 tabular-nums">{row.tempC !== null ? <Temperature c={row.tempC} /> : "—"}</td>
                <td className="px-3 py-2 tabular-nums">{row.rh !== null ? `${row.rh} %` : "—"}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </section>
  );
}
