// Sends a file to an import handler with XMLHttpRequest, so both halves of a large
// import show: the bytes going up (upload.onprogress) and the server's NDJSON progress
// lines coming back, the last of which is the outcome.
import type { ErrorBody } from "@/lib/errors";
import type { ReadingImportQuery } from "@/lib/schemas/reading-import";

export type ImportStage = "sending" | "reading" | "checking" | "writing";
export type ImportProgress = { stage: ImportStage; done: number; total: number };
export type ImportOutcome<T> = { ok: true; data: T } | { ok: false; status: number; message: string; fields?: Record<string, string>; rows?: { line: number; message: string }[] };

type Line = { type: "progress"; stage: ImportStage; done: number; total: number } | ({ type: "result"; status: number } & Record<string, unknown>) | ({ type: "error"; status: number; rows?: { line: number; message: string }[] } & ErrorBody);

export function sendImport<T>(url: string, file: File, query: ReadingImportQuery, onProgress: (progress: ImportProgress) => void): Promise<ImportOutcome<T>> {
  return new Promise((resolve) => {
    const xhr = new XMLHttpRequest();
    xhr.open("POST", `${url}?${new URLSearchParams(query).toString()}`);
    xhr.setRequestHeader("accept", "application/x-ndjson, application/json");
    xhr.setRequestHeader("content-type", "text/csv");
    let read = 0;
    let last: Line | null = null;
    const takeLines = () => {
      const text = xhr.responseText;
      let end = text.indexOf("\n", read);
      while (end !== -1) {
        const line = text.slice(read, end).trim();
        read = end + 1;
        if (line) {
          try {
            last = JSON.parse(line) as Line;
            if (last.type === "progress") onProgress({ stage: last.stage, done: last.done, total: last.total });
          } catch {
            // A line that is not JSON is not ours (a proxy's page, say): the status decides below.
          }
        }
        end = text.indexOf("\n", read);
      }
    };
    xhr.upload.onprogress = (event) => {
      if (event.lengthComputable) onProgress({ stage: "sending", done: event.loaded, total: event.total });
    };
    xhr.onprogress = takeLines;
    xhr.onerror = () => resolve({ ok: false, status: 0, message: "Could not reach Cloche. Check your connection and try again." });
    xhr.onload = () => {
      const isLines = (xhr.getResponseHeader("content-type") ?? "").includes("ndjson");
      if (!isLines) {
        // Refused before any work: one JSON body with the status.
        type Refused = Partial<ErrorBody> & { rows?: { line: number; message: string }[] };
        let body: Refused | null;
        try {
          body = JSON.parse(xhr.responseText) as Refused;
        } catch {
          body = null;
        }
        return resolve({ ok: false, status: xhr.status, message: body?.error?.message ?? `Cloche answered with status ${xhr.status}. Please try again.`, fields: body?.error?.fields, rows: body?.rows });
      }
      takeLines();
      const end = last as Line | null;
      if (end?.type === "result") return resolve({ ok: true, data: end as unknown as T });
      if (end?.type === "error") return resolve({ ok: false, status: end.status, message: end.error.message, fields: end.error.fields, rows: end.rows });
      resolve({ ok: false, status: xhr.status, message: "The answer stopped before the end. Please try again." });
    };
    xhr.send(file);
  });
}

const count = (n: number) => n.toLocaleString("en-GB");

/** The progress in words, beside the bar. */
export function progressWords({ stage, done, total }: ImportProgress): string {
  if (stage === "sending") return `Sending the file: ${Math.round((100 * done) / Math.max(total, 1))} %`;
  if (stage === "reading") return `Reading rows: ${count(done)} of ${count(total)}`;
  if (stage === "checking") return `Looking for minutes already stored: ${count(done)} of ${count(total)}`;
  return `Writing minutes: ${count(done)} of ${count(total)}`;
}
