"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useMemo, useState } from "react";
import { useForm } from "react-hook-form";
import { Button } from "@/components/ui/Button";
import { Field } from "@/components/ui/Field";
import { FileRefusal } from "@/components/ui/FileRefusal";
import { Select } from "@/components/ui/Select";
import { readCsvFile, DELIMITER_NAMES } from "@/lib/readings-import/file";
import { DATE_FORMATS, DATE_FORMAT_LABELS } from "@/lib/readings-import/formats";
import { guessOptions, sampleRows } from "@/lib/readings-import/guess";
import { READING_IMPORT_LIMITS, readingImportOptionsSchema, type ReadingImportOptions } from "@/lib/schemas/reading-import";
import { ImportPreview, type PreviewResult } from "./ImportPreview";
import { progressWords, sendImport, type ImportProgress } from "./upload";

export type ImportSensorChoice = { id: string; name: string; houseName: string; placement: "inside" | "outside" };
type Imported = { import: { rowsRead: number; minutesAdded: number; minutesAlreadyThere: number; note: string | null } };

const FIELDS = ["timeColumn", "temperatureColumn", "humidityColumn", "dateFormat", "timeZone", "unit", "decimal"] as const;
const MB = 1024 * 1024;
const count = (n: number) => n.toLocaleString("en-GB");

/** A blob's bytes (FileReader: every browser has it, and so does jsdom). */
function bytesOf(blob: Blob): Promise<Uint8Array> {
  return new Promise((resolve, reject) => {
    const reader = new FileReader();
    reader.onload = () => resolve(new Uint8Array(reader.result as ArrayBuffer));
    reader.onerror = () => reject(reader.error ?? new Error("The file could not be read."));
    reader.readAsArrayBuffer(blob);
  });
}

function zones(siteZone: string): string[] {
  const all = (Intl as unknown as { supportedValuesOf?: (key: string) => string[] }).supportedValuesOf?.("timeZone") ?? [];
  return [...new Set([siteZone, "UTC", ...all])];
}

/**
 * A thermometer app's CSV into a sensor's history: the file's columns and how it writes
 * times and numbers (guessed from its start, each changeable), a preview of what would
 * be imported with every bad row named, then the import itself, with progress.
 */
export function ReadingImport({ siteId, siteZone, sensors, sensorId: initialSensor }: { siteId: string; siteZone: string; sensors: ImportSensorChoice[]; sensorId?: string }) {
  const router = useRouter();
  const [sensorId, setSensorId] = useState(initialSensor ?? sensors[0]?.id ?? "");
  const [file, setFile] = useState<File | null>(null);
  const [header, setHeader] = useState<string[]>([]);
  const [fileNote, setFileNote] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [errorRows, setErrorRows] = useState<{ line: number; message: string }[]>([]);
  const [progress, setProgress] = useState<ImportProgress | null>(null);
  const [preview, setPreview] = useState<PreviewResult | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const zoneList = useMemo(() => zones(siteZone), [siteZone]);

  const form = useForm<ReadingImportOptions>({
    resolver: zodResolver(readingImportOptionsSchema),
    defaultValues: { timeColumn: "", temperatureColumn: "", humidityColumn: "", dateFormat: "iso", timeZone: siteZone, unit: "c", decimal: "." },
  });
  const {
    register,
    handleSubmit,
    reset,
    setError: setFieldError,
    formState: { errors },
  } = form;
  const busy = progress !== null;

  const clearOutcome = () => {
    setPreview(null);
    setDone(null);
    setError(null);
    setErrorRows([]);
  };

  async function chooseFile(chosen: File | null) {
    clearOutcome();
    setFile(null);
    setHeader([]);
    setFileNote(null);
    if (!chosen) return;
    if (chosen.size > READING_IMPORT_LIMITS.maxBytes) {
      setError(`That file is ${(chosen.size / MB).toFixed(1)} MB; import at most ${READING_IMPORT_LIMITS.maxBytes / MB} MB at a time (split it by date).`);
      return;
    }
    // The start of the file is enough for the columns and the guesses; cut at a line end.
    const start = await bytesOf(chosen.slice(0, 64 * 1024));
    const cut = chosen.size > start.length ? start.lastIndexOf(0x0a) + 1 : start.length;
    const checked = readCsvFile(start.subarray(0, cut || start.length), { partial: true });
    if (!checked.ok) {
      setError(checked.message);
      return;
    }
    const guess = guessOptions(checked, sampleRows(checked));
    reset({ ...form.getValues(), ...guess });
    setFile(chosen);
    setHeader(checked.header.filter((h) => h !== ""));
    setFileNote(`Columns separated by ${DELIMITER_NAMES[checked.delimiter]}. Cloche guessed the settings below from the first lines; check them against the preview.`);
  }

  function refused(result: { message: string; fields?: Record<string, string>; rows?: { line: number; message: string }[] }) {
    for (const [name, message] of Object.entries(result.fields ?? {})) {
      if ((FIELDS as readonly string[]).includes(name)) setFieldError(name as (typeof FIELDS)[number], { message });
    }
    setError(result.message);
    setErrorRows(result.rows ?? []);
  }

  const run = (step: "preview" | "import") =>
    handleSubmit(async (options) => {
      if (!file || !sensorId) return;
      const shown = preview;
      clearOutcome();
      // The preview stays in sight while its import runs.
      if (step === "import") setPreview(shown);
      setProgress({ stage: "sending", done: 0, total: file.size });
      const url = `/api/sites/${siteId}/sensors/${sensorId}/import${step === "preview" ? "/preview" : ""}`;
      const query = { ...options, fileName: file.name };
      if (step === "preview") {
        const result = await sendImport<PreviewResult>(url, file, query, setProgress);
        setProgress(null);
        if (result.ok) setPreview(result.data);
        else refused(result);
        return;
      }
      const result = await sendImport<Imported>(url, file, query, setProgress);
      setProgress(null);
      setPreview(null);
      if (!result.ok) return refused(result);
      // The list of earlier imports below the form.
      router.refresh();
      const { rowsRead, minutesAdded, minutesAlreadyThere, note } = result.data.import;
      setDone(
        `Imported ${file.name}: ${count(rowsRead)} rows read, ${count(minutesAdded)} new ${minutesAdded === 1 ? "minute" : "minutes"} added, ${count(minutesAlreadyThere)} already stored left as they were.${note ? ` ${note}` : ""}`,
      );
    })();

  const columnOptions = (withNone: boolean) => (
    <>
      {withNone ? <option value="">No humidity</option> : <option value="">Choose a column</option>}
      {header.map((h) => (
        <option key={h} value={h}>
          {h}
        </option>
      ))}
    </>
  );
  const optionsChanged = { onChange: () => setPreview(null) };
  const chosenSensor = sensors.find((s) => s.id === sensorId);

  return (
    <form onSubmit={(event) => event.preventDefault()} className="flex flex-col gap-5" noValidate>
      <Field label="Sensor" hint={chosenSensor?.placement === "outside" ? "An outside sensor: its readings feed the degree-days." : "The readings become this sensor's history in its house's charts."}>
        {(control) => (
          <Select
            {...control}
            value={sensorId}
            onChange={(event) => {
              setSensorId(event.target.value);
              clearOutcome();
            }}
          >
            {[...new Set(sensors.map((s) => s.houseName))].map((house) => (
              <optgroup key={house} label={house}>
                {sensors
                  .filter((s) => s.houseName === house)
                  .map((s) => (
                    <option key={s.id} value={s.id}>
                      {s.name}
                      {s.placement === "outside" ? " (outside)" : ""}
                    </option>
                  ))}
              </optgroup>
            ))}
          </Select>
        )}
      </Field>

      <Field
        label="CSV file from the thermometer's app"
        hint={`A first line naming the columns, then one reading per line. At most ${READING_IMPORT_LIMITS.maxBytes / MB} MB and ${count(READING_IMPORT_LIMITS.maxRows)} rows.`}
      >
        {(control) => (
          <input
            {...control}
            type="file"
            accept=".csv,.txt,.tsv,text/csv,text/plain"
            disabled={busy}
            onChange={(event) => void chooseFile(event.target.files?.[0] ?? null)}
            className="block min-h-11 w-full text-sm text-frost-900 file:mr-3 file:min-h-11 file:rounded-lg file:border file:border-frost-300 file:bg-white file:px-4 file:font-semibold file:text-frost-900"
          />
        )}
      </Field>

      {file ? (
        <fieldset className="flex flex-col gap-4 rounded-card border border-frost-200 p-4" disabled={busy}>
          <legend className="px-1 text-sm font-semibold text-frost-900">How the file is written</legend>
          {fileNote ? <p className="text-sm text-frost-600">{fileNote}</p> : null}
          <div className="grid gap-4 sm:grid-cols-3">
            <Field label="Time column" error={errors.timeColumn?.message}>
              {(control) => <Select {...control} {...register("timeColumn", optionsChanged)}>{columnOptions(false)}</Select>}
            </Field>
            <Field label="Temperature column" error={errors.temperatureColumn?.message}>
              {(control) => <Select {...control} {...register("temperatureColumn", optionsChanged)}>{columnOptions(false)}</Select>}
            </Field>
            <Field label="Humidity column" error={errors.humidityColumn?.message}>
              {(control) => <Select {...control} {...register("humidityColumn", optionsChanged)}>{columnOptions(true)}</Select>}
            </Field>
          </div>
          <Field label="How times are written" error={errors.dateFormat?.message}>
            {(control) => (
              <Select {...control} {...register("dateFormat", optionsChanged)}>
                {DATE_FORMATS.map((f) => (
                  <option key={f} value={f}>
                    {DATE_FORMAT_LABELS[f]}
                  </option>
                ))}
              </Select>
            )}
          </Field>
          <Field label="Time zone of the times" hint="For times written without an offset. A time ending in Z or +01:00 keeps its own." error={errors.timeZone?.message}>
            {(control) => (
              <Select {...control} {...register("timeZone", optionsChanged)}>
                {zoneList.map((z) => (
                  <option key={z} value={z}>
                    {z === siteZone ? `${z} (the site's)` : z}
                  </option>
                ))}
              </Select>
            )}
          </Field>
          <div className="grid gap-4 sm:grid-cols-2">
            <Choice legend="Temperatures in" name="unit" register={register} onChange={optionsChanged.onChange} choices={[["c", "°C"], ["f", "°F"]]} />
            <Choice legend="Decimal separator" name="decimal" register={register} onChange={optionsChanged.onChange} choices={[[".", "Point (21.5)"], [",", "Comma (21,5)"]]} />
          </div>
        </fieldset>
      ) : null}

      {error ? <FileRefusal message={error} lines={errorRows} /> : null}
      {done ? (
        <p role="status" className="rounded-lg bg-leaf-50 px-3 py-2.5 text-sm text-leaf-800">
          {done}
        </p>
      ) : null}

      {preview ? <ImportPreview preview={preview} siteZone={siteZone} /> : null}

      {progress ? (
        <div className="flex flex-col gap-1.5" aria-live="polite">
          <progress className="h-4 w-full accent-leaf-700" value={progress.done} max={Math.max(progress.total, 1)} aria-label="Import progress" />
          <p className="text-sm text-frost-700">{progressWords(progress)}</p>
        </div>
      ) : null}

      {file ? (
        <div className="flex flex-wrap gap-2">
          <Button variant={preview ? "secondary" : "primary"} pending={busy && !preview} pendingLabel="Checking…" onClick={() => void run("preview")} disabled={busy}>
            {preview ? "Check again" : "Check the file"}
          </Button>
          {preview && preview.bad === 0 ? (
            <Button pending={busy} pendingLabel="Importing…" onClick={() => void run("import")}>
              Import {count(preview.newMinutes)} new {preview.newMinutes === 1 ? "minute" : "minutes"}
            </Button>
          ) : null}
        </div>
      ) : null}
    </form>
  );
}

type ChoiceProps = {
  legend: string;
  name: "unit" | "decimal";
  register: ReturnType<typeof useForm<ReadingImportOptions>>["register"];
  onChange: () => void;
  choices: [string, string][];
};

function Choice({ legend, name, register, onChange, choices }: ChoiceProps) {
  return (
    <fieldset className="flex flex-col gap-1.5">
      <legend className="text-sm font-medium text-frost-900">{legend}</legend>
      <div className="flex flex-wrap gap-2">
        {choices.map(([value, label]) => (
          <label key={value} className="inline-flex min-h-11 items-center gap-2 rounded-lg border border-frost-300 bg-white px-3 text-sm text-frost-900 has-[:checked]:border-leaf-700 has-[:checked]:bg-leaf-50">
            <input type="radio" value={value} className="h-5 w-5 accent-leaf-700" {...register(name, { onChange })} />
            {label}
          </label>
        ))}
      </div>
    </fieldset>
  );
}
