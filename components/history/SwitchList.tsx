"use client";

import { Temperature } from "@/components/site/TemperatureUnit";
import { causeLabel, latencyText, localParts, onOff, readingAge, statusNote, type SwitchJson } from "./switch-text";

const badgeTone: Record<SwitchJson["status"], string> = {
  carried_out: "",
  withdrawn: "border-frost-300 bg-frost-100 text-frost-800",
  observed: "border-soil-200 bg-soil-50 text-soil-800",
  unconfirmed: "border-ember-200 bg-ember-50 text-ember-800",
};

function StatusBadge({ row }: { row: SwitchJson }) {
  const note = statusNote(row);
  if (!note) return null;
  return <p className={`mt-1 inline-block rounded-md border px-2 py-0.5 text-xs font-medium ${badgeTone[row.status]}`}>{note}</p>;
}

/** "Off → On", struck through when the switch was withdrawn (it never happened). */
function Change({ row }: { row: SwitchJson }) {
  const text = `${onOff(row.fromOn)} → ${onOff(row.toOn)}`;
  return row.status === "withdrawn" ? (
    <span className="text-frost-600 line-through decoration-2">{text}</span>
  ) : (
    <span className={row.toOn ? "font-semibold text-leaf-800" : "font-semibold text-frost-900"}>{text}</span>
  );
}

function Reading({ row }: { row: SwitchJson }) {
  if (row.readingTempC === null) return <span className="text-frost-600">—</span>;
  const age = readingAge(row.at, row.readingAt);
  return (
    <span>
      <Temperature c={row.readingTempC} />
      {age ? <span className="text-frost-600"> · {age}</span> : null}
    </span>
  );
}

function Who({ row }: { row: SwitchJson }) {
  if (row.cause !== "override") return null;
  return (
    <span>
      {row.userName ?? "Someone no longer a member"}
      {row.reason ? <span className="text-frost-700">: “{row.reason}”</span> : null}
    </span>
  );
}

function PlugName({ row }: { row: SwitchJson }) {
  return (
    <>
      {row.plugName}
      {row.plugRetired ? <span className="font-normal text-frost-600"> (retired)</span> : null}
    </>
  );
}

/** The switches as cards on a phone and as a table from 640 px. */
export function SwitchList({ rows, timeZone }: { rows: SwitchJson[]; timeZone: string }) {
  return (
    <>
      <ul className="mt-3 flex flex-col gap-3 sm:hidden">
        {rows.map((row) => {
          const { day, time } = localParts(row.at, timeZone);
          const latency = latencyText(row.latencyMs);
          return (
            <li key={row.id} className={`rounded-lg border px-4 py-3 ${row.status === "withdrawn" ? "border-dashed border-frost-300 bg-frost-50" : "border-frost-200"}`}>
              <div className="flex items-baseline justify-between gap-3">
                <p className="font-semibold text-frost-950">
                  <PlugName row={row} />
                </p>
                <Change row={row} />
              </div>
              <p className="text-sm text-frost-700">
                {row.houseName} · <time dateTime={row.at}>{day}, {time}</time>
              </p>
              <p className="mt-1 text-sm text-frost-900">
                {causeLabel(row.cause)}
                {row.readingTempC !== null ? (
                  <>
                    {" · "}
                    <Reading row={row} />
                  </>
                ) : null}
              </p>
              {row.cause === "override" ? (
                <p className="text-sm text-frost-900">
                  <Who row={row} />
                </p>
              ) : null}
              {latency && row.status === "carried_out" ? <p className="text-xs text-frost-600">Plug {latency}</p> : null}
              <StatusBadge row={row} />
            </li>
          );
        })}
      </ul>

      <div className="mt-3 hidden overflow-x-auto sm:block">
        <table className="w-full text-left text-sm">
          <caption className="sr-only">Switches, newest first, times in {timeZone}</caption>
          <thead className="border-b border-frost-200 text-xs uppercase tracking-wide text-frost-600">
            <tr>
              <th scope="col" className="py-2 pr-3 font-medium">When ({timeZone})</th>
              <th scope="col" className="py-2 pr-3 font-medium">Plug</th>
              <th scope="col" className="py-2 pr-3 font-medium">Change</th>
              <th scope="col" className="py-2 pr-3 font-medium">Why</th>
              <th scope="col" className="py-2 pr-3 font-medium">Reading</th>
              <th scope="col" className="py-2 font-medium">Plug’s answer</th>
            </tr>
          </thead>
          <tbody className="divide-y divide-frost-100">
            {rows.map((row) => {
              const { day, time } = localParts(row.at, timeZone);
              return (
                <tr key={row.id} className={row.status === "withdrawn" ? "bg-frost-50" : undefined}>
                  <td className="py-2.5 pr-3 align-top whitespace-nowrap">
                    <time dateTime={row.at}>
                      <span className="block text-frost-950">{time}</span>
                      <span className="block text-xs text-frost-600">{day}</span>
                    </time>
                  </td>
                  <td className="py-2.5 pr-3 align-top">
                    <span className="block font-medium text-frost-950">
                      <PlugName row={row} />
                    </span>
                    <span className="block text-xs text-frost-600">{row.houseName}</span>
                  </td>
                  <td className="py-2.5 pr-3 align-top whitespace-nowrap">
                    <Change row={row} />
                  </td>
                  <td className="py-2.5 pr-3 align-top">
                    <span className="block text-frost-900">{causeLabel(row.cause)}</span>
                    {row.cause === "override" ? (
                      <span className="block text-xs text-frost-700">
                        <Who row={row} />
                      </span>
                    ) : null}
                  </td>
                  <td className="py-2.5 pr-3 align-top">
                    <Reading row={row} />
                  </td>
                  <td className="py-2.5 align-top">
                    {row.status === "carried_out" ? <span className="text-frost-700">{latencyText(row.latencyMs) ?? "Confirmed"}</span> : <StatusBadge row={row} />}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
    </>
  );
}
