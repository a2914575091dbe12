// The two steps of importing a thermometer app's CSV for a sensor share one reading of
// the request: the file is the request's body (at most READING_IMPORT_LIMITS.maxBytes),
// the options are its query. The file's checks (empty, not CSV, too large) answer with
// their status before any work; the rows are then read with progress. A client that
// accepts application/x-ndjson gets that progress as lines
// ({"type":"progress","stage","done","total"}) and the outcome as the last line
// ({"type":"result",…} or {"type":"error","status",…}); others get one JSON answer.
import "server-only";
import { createHash } from "node:crypto";
import type { ImportSensor } from "@/db/queries/reading-imports";
import { AppError, errorBody, toAppError } from "@/lib/errors";
import { readCsvFile, type CsvFile } from "@/lib/readings-import/file";
import { READING_IMPORT_LIMITS } from "@/lib/schemas/reading-import";

export type Stage = "reading" | "checking" | "writing";
export type Report = (stage: Stage, done: number, total: number) => Promise<void>;

const MB = 1024 * 1024;
const tooLarge = () => new AppError("too_large", `The file is larger than ${READING_IMPORT_LIMITS.maxBytes / MB} MB; import at most ${READING_IMPORT_LIMITS.maxBytes / MB} MB at a time (split it by date).`);

/** The body's bytes, refused past the limit as soon as it is passed (the rest is not read). */
async function readBody(request: Request): Promise<Uint8Array> {
  const declared = Number(request.headers.get("content-length") ?? "0");
  if (declared > READING_IMPORT_LIMITS.maxBytes) throw tooLarge();
  if (!request.body) return new Uint8Array();
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let size = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    size += value.byteLength;
    if (size > READING_IMPORT_LIMITS.maxBytes) {
      await reader.cancel();
      throw tooLarge();
    }
    chunks.push(value);
  }
  const bytes = new Uint8Array(size);
  let at = 0;
  for (const chunk of chunks) {
    bytes.set(chunk, at);
    at += chunk.byteLength;
  }
  return bytes;
}

export type UploadedFile = { file: CsvFile; sha256: string };

/** The uploaded file checked as CSV; a file that is not one is a 400 (413 when too large). */
export async function readUpload(request: Request): Promise<UploadedFile> {
  const bytes = await readBody(request);
  const sha256 = createHash("sha256").update(bytes).digest("hex");
  const file = readCsvFile(bytes);
  if (!file.ok) throw new AppError(file.code, file.message, { file: file.message });
  return { file, sha256 };
}

/** An answer the work may end with besides success: a status, the error and what goes with it. */
export class Refusal extends Error {
  constructor(
    readonly error: AppError,
    readonly extra: Record<string, unknown> = {},
  ) {
    super(error.message);
  }
}

/** Runs the import's work and answers as one JSON body or as NDJSON progress lines. */
export function answer(request: Request, work: (report: Report) => Promise<Record<string, unknown>>, status = 200): Promise<Response> | Response {
  const wantsLines = (request.headers.get("accept") ?? "").includes("application/x-ndjson");
  if (!wantsLines) {
    return work(async () => {}).then(
      (result) => Response.json(result, { status }),
      (error: unknown) => {
        if (error instanceof Refusal) return Response.json({ ...errorBody(error.error), ...error.extra }, { status: error.error.status });
        throw error;
      },
    );
  }
  const encoder = new TextEncoder();
  let lastSent = 0;
  const stream = new ReadableStream<Uint8Array>({
    async start(controller) {
      const send = (line: unknown) => controller.enqueue(encoder.encode(`${JSON.stringify(line)}\n`));
      // A line per stage step, at most every 100 ms, and a turn of the event loop so it leaves.
      const report: Report = async (stage, done, total) => {
        const now = Date.now();
        if (done < total && now - lastSent < 100) return;
        lastSent = now;
        send({ type: "progress", stage, done, total });
        await new Promise((resolve) => setImmediate(resolve));
      };
      try {
        send({ type: "result", status, ...(await work(report)) });
      } catch (error) {
        const refusal = error instanceof Refusal ? error : null;
        const appError = refusal ? refusal.error : toAppError(error);
        send({ type: "error", status: appError.status, ...errorBody(appError), ...(refusal?.extra ?? {}) });
      }
      controller.close();
    },
  });
  return new Response(stream, { status: 200, headers: { "content-type": "application/x-ndjson; charset=utf-8", "cache-control": "no-store", "x-accel-buffering": "no" } });
}

/** The sensor the readings are for, as the answers name it. */
export const sensorOf = (sensor: ImportSensor) => ({ id: sensor.id, name: sensor.name, placement: sensor.placement, houseName: sensor.houseName });
