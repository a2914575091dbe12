// The pure reading of a thermometer app's CSV: the file checks, each date format, the
// zone's clock changes, units and decimal commas, and the per-row problems.
import { readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { readCsvFile, type CsvFile } from "@/lib/readings-import/file";
import { readTime } from "@/lib/readings-import/formats";
import { guessOptions, sampleRows } from "@/lib/readings-import/guess";
import { parseReadings, readNumber, repeatedHourNote } from "@/lib/readings-import/parse";
import { zoneReader } from "@/lib/readings-import/zone";
import type { ReadingImportOptions } from "@/lib/schemas/reading-import";

const enc = (text: string) => new TextEncoder().encode(text);
const NOW = Date.UTC(2026, 11, 31);
const base: ReadingImportOptions = { timeColumn: "Time", temperatureColumn: "Temp", humidityColumn: "RH", dateFormat: "iso", timeZone: "Europe/London", unit: "c", decimal: "." };

function file(text: string): CsvFile {
  const result = readCsvFile(enc(text));
  if (!result.ok) throw new Error(result.message);
  return result;
}

async function read(text: string, options: Partial<ReadingImportOptions> = {}) {
  const result = await parseReadings(file(text), { ...base, ...options }, { now: NOW });
  if (!result.ok) throw new Error(result.message);
  return result;
}

describe("the file as a whole", () => {
  it("refuses an empty file, binary bytes, a file without separators and a header of values", () => {
    expect(readCsvFile(enc(""))).toMatchObject({ ok: false, message: "The file is empty." });
    expect(readCsvFile(enc("  \r\n\r\n"))).toMatchObject({ ok: false, message: "The file is empty." });
    expect(readCsvFile(new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13]))).toMatchObject({ ok: false, message: expect.stringContaining("not a CSV file") });
    expect(readCsvFile(enc("just some words\nand more words\n"))).toMatchObject({ ok: false, message: expect.stringContaining("no commas, semicolons or tabs") });
    expect(readCsvFile(enc("2026-03-01 10:00,21.5\n2026-03-01 10:01,21.6\n"))).toMatchObject({ ok: false, message: expect.stringContaining("should name the columns") });
    expect(readCsvFile(enc("Time,Temp\n\n"))).toMatchObject({ ok: false, message: "The file has a header but no readings." });
  });

  it("finds the separator among commas, semicolons and tabs, outside quotes", () => {
    expect(file("Time;Temp;RH\n2026-03-01 10:00;21,5;60\n").delimiter).toBe(";");
    expect(file("Time\tTemp\n2026-03-01 10:00\t21.5\n").delimiter).toBe("\t");
    expect(file('"Time, local",Temp\n2026-03-01 10:00,21.5\n').delimiter).toBe(",");
  });

  it("reads a byte-order mark and Windows line ends, UTF-16 and Windows-1252 text", async () => {
    const withBom = new Uint8Array([0xef, 0xbb, 0xbf, ...enc("Time,Temp,RH\r\n2026-03-01 10:00,21.5,60\r\n2026-03-01 10:01,21.7,61\r\n")]);
    const parsed = readCsvFile(withBom);
    expect(parsed).toMatchObject({ ok: true, header: ["Time", "Temp", "RH"], dataLines: 2 });
    const result = await parseReadings(parsed as CsvFile, base, { now: NOW });
    expect(result).toMatchObject({ ok: true, rows: 2, good: 2, bad: 0 });

    const text = "Time\tTemp (°C)\n2026-03-01 10:00\t21.5\n";
    const utf16 = new Uint8Array([0xff, 0xfe, ...new Uint8Array(Uint16Array.from(text, (c) => c.charCodeAt(0)).buffer)]);
    expect(readCsvFile(utf16)).toMatchObject({ ok: true, header: ["Time", "Temp (°C)"] });
    // "°" is 0xB0 in Windows-1252, not valid UTF-8 on its own.
    const latin = new Uint8Array([...enc("Time;Temp "), 0xb0, ...enc("C\n2026-03-01 10:00;21,5\n")]);
    expect(readCsvFile(latin)).toMatchObject({ ok: true, header: ["Time", "Temp °C"] });
  });

  it("holds the row limit", () => {
    const lines = Array.from({ length: 200_001 }, (_, i) => `${i},1`).join("\n");
    expect(readCsvFile(enc(`Time,Temp\n${lines}\n`))).toMatchObject({ ok: false, code: "too_large", message: expect.stringContaining("200,001 lines") });
  });
});

describe("date formats", () => {
  const wall = { year: 2026, month: 3, day: 14, hour: 18, minute: 5, second: 0, millisecond: 0 };
  it("reads each format's example of the same wall-clock time", () => {
    expect(readTime("2026-03-14 18:05:00", "iso")).toEqual({ kind: "local", wall });
    expect(readTime("2026-03-14T18:05", "iso")).toEqual({ kind: "local", wall });
    expect(readTime("14/03/2026 18:05:00", "dmy_slash")).toEqual({ kind: "local", wall });
    expect(readTime("03/14/2026 18:05", "mdy_slash")).toEqual({ kind: "local", wall });
    expect(readTime("14.03.2026 18:05:00", "dmy_dot")).toEqual({ kind: "local", wall });
  });

  it("keeps a time's own offset or Z, and reads Unix seconds as UTC", () => {
    const utc = Date.UTC(2026, 2, 14, 18, 5);
    expect(readTime("2026-03-14T18:05:00Z", "iso")).toEqual({ kind: "instant", ms: utc });
    expect(readTime("2026-03-14T19:05:00+01:00", "iso")).toEqual({ kind: "instant", ms: utc });
    expect(readTime("2026-03-14 13:05-0500", "iso")).toEqual({ kind: "instant", ms: utc });
    expect(readTime("1773511500", "unix")).toEqual({ kind: "instant", ms: utc });
  });

  it("says what is wrong with a time", () => {
    expect(readTime("14/03/2026 18:05", "iso")).toEqual({ kind: "bad", reason: "is not in the format YYYY-MM-DD HH:mm[:ss]" });
    expect(readTime("31/02/2026 10:00", "dmy_slash")).toEqual({ kind: "bad", reason: "is not a real date and time" });
    expect(readTime("2026-03-14 24:00", "iso")).toEqual({ kind: "bad", reason: "is not a real date and time" });
    expect(readTime("1773511500000", "unix")).toMatchObject({ reason: expect.stringContaining("milliseconds") });
    expect(readTime(" ", "unix")).toEqual({ kind: "bad", reason: "is empty" });
  });
});

describe("time zones", () => {
  // Europe/London in 2026 (IANA tz database, "europe" file, Rule EU: last Sunday of
  // March at 01:00 UTC the clocks go from 01:00 GMT to 02:00 BST; last Sunday of
  // October at 01:00 UTC from 02:00 BST back to 01:00 GMT): 29 March and 25 October.
  const london = zoneReader("Europe/London");
  const wall = (month: number, day: number, hour: number, minute: number) => ({ year: 2026, month, day, hour, minute, second: 0, millisecond: 0 });

  it("finds the instant of an ordinary local time in winter and summer", () => {
    expect(london.toInstant(wall(1, 10, 12, 0))).toEqual({ kind: "one", ms: Date.UTC(2026, 0, 10, 12) });
    expect(london.toInstant(wall(7, 10, 12, 0))).toEqual({ kind: "one", ms: Date.UTC(2026, 6, 10, 11) });
  });

  it("knows the skipped hour of 29 March 2026 and the repeated hour of 25 October 2026", () => {
    expect(london.toInstant(wall(3, 29, 1, 30))).toEqual({ kind: "gap", atMs: Date.UTC(2026, 2, 29, 1), fromLocal: "01:00", toLocal: "02:00" });
    expect(london.toInstant(wall(3, 29, 0, 59))).toEqual({ kind: "one", ms: Date.UTC(2026, 2, 29, 0, 59) });
    expect(london.toInstant(wall(3, 29, 2, 0))).toEqual({ kind: "one", ms: Date.UTC(2026, 2, 29, 1, 0) });
    expect(london.toInstant(wall(10, 25, 1, 30))).toEqual({ kind: "two", first: Date.UTC(2026, 9, 25, 0, 30), second: Date.UTC(2026, 9, 25, 1, 30) });
  });

  it("names the date of the skipped hour in the row's problem, in another zone too", async () => {
    const result = await read("Time,Temp,RH\n2026-03-29 00:30,5,80\n2026-03-29 01:30,5,80\n2026-03-29 02:30,5,80\n");
    expect(result.problems).toEqual([{ line: 3, message: 'time "2026-03-29 01:30" does not exist in Europe/London: the clocks went forward from 01:00 to 02:00 on 29 March 2026' }]);
    // America/New_York, 8 March 2026: 02:00 EST → 03:00 EDT (IANA tz, "northamerica", Rule US: second Sunday of March).
    const ny = await read("Time,Temp,RH\n03/08/2026 02:15,5,80\n", { timeZone: "America/New_York", dateFormat: "mdy_slash" });
    expect(ny.problems[0]!.message).toContain("from 02:00 to 03:00 on 8 March 2026");
  });

  it("takes the repeated hour as the first time round, and the second when the same time comes again, with a note", async () => {
    const rows = ["00:30", "01:00", "01:30", "01:00", "01:30", "02:00"].map((t, i) => `2026-10-25 ${t},${10 + i},70`);
    const result = await read(`Time,Temp,RH\n${rows.join("\n")}\n`);
    expect(result).toMatchObject({ rows: 6, good: 6, bad: 0 });
    expect(result.minutes.minute.map((m) => new Date(m).toISOString().slice(11, 16))).toEqual(["23:30", "00:00", "00:30", "01:00", "01:30", "02:00"]);
    expect(result.repeatedHour).toEqual({ rows: 4, dates: ["2026-10-25"] });
    expect(repeatedHourNote(result, "Europe/London")).toContain("25 October 2026");
  });
});

describe("numbers and units", () => {
  it("converts °F to °C: 32 °F = 0 °C and 212 °F = 100 °C (NIST SP 811, B.9) — and 212 °F is then out of range", async () => {
    const result = await read("Time,Temp,RH\n2026-03-01 10:00,32,50\n2026-03-01 10:01,50,50\n2026-03-01 10:02,212,50\n", { unit: "f" });
    expect(result.preview.map((r) => r.tempC)).toEqual([0, 10, 100]);
    expect(result.problems).toEqual([{ line: 4, message: "temperature 212 °F (100 °C) is outside -50 to 70 °C" }]);
  });

  it("reads decimal commas with semicolons, and with commas when the numbers are quoted", async () => {
    const semi = await read("Time;Temp;RH\n2026-03-01 10:00;21,5;60,25\n", { decimal: "," });
    expect(semi.preview[0]).toMatchObject({ tempC: 21.5, rh: 60.25, problem: null });
    const quoted = await read('Time,Temp,RH\n2026-03-01 10:00,"21,5","60,5"\n', { decimal: "," });
    expect(quoted.preview[0]).toMatchObject({ tempC: 21.5, rh: 60.5 });
    const unquoted = await read("Time,Temp,RH\n2026-03-01 10:00,21,5,60,5\n", { decimal: "," });
    expect(unquoted.problems[0]!.message).toContain("put each number in quotes or separate the columns with semicolons");
  });

  it("says when a number uses the other decimal separator or is not one", () => {
    expect(readNumber("21.5", ",")).toBe('"21.5" has a decimal point; the import was set to a decimal comma');
    expect(readNumber("21,5", ".")).toBe('"21,5" has a decimal comma; the import was set to a decimal point');
    expect(readNumber("warm", ".")).toBe('"warm" is not a number');
    expect(readNumber("−3.5", ".")).toBe(-3.5);
  });
});

describe("each row's problems", () => {
  it("names every bad row by its line, counts good and bad, and sums good rows per minute", async () => {
    const text = [
      "Time,Temp,RH",
      "2026-03-01 10:00:10,20,60",
      "2026-03-01 10:00:40,22,",
      "yesterday,21,60",
      "",
      "2026-03-01 10:01:00,abc,60",
      "2026-03-01 10:02:00,21,101",
      "2026-03-01 10:00:10,20,60",
      "2027-06-01 10:00,20,60",
      "2026-03-01 10:03:00,-51,60",
      "2026-03-01 10:04",
    ].join("\r\n");
    const result = await read(text);
    expect(result).toMatchObject({ rows: 9, good: 2, bad: 7 });
    expect(result.problems).toEqual([
      { line: 4, message: 'time "yesterday" is not in the format YYYY-MM-DD HH:mm[:ss]' },
      { line: 6, message: 'temperature "abc" is not a number' },
      { line: 7, message: "humidity 101 % is outside 0 to 100 %" },
      { line: 8, message: "the same time as line 2" },
      { line: 9, message: 'time "2027-06-01 10:00" is in the future' },
      { line: 10, message: "temperature -51 °C is outside -50 to 70 °C" },
      { line: 11, message: "has 1 values where the header names 3" },
    ]);
    expect(result.minutes).toEqual({ minute: [Date.UTC(2026, 2, 1, 10)], samples: [2], min: [20], max: [22], mean: [21], rhMean: [60] });
  });

  it("names a missing column, and lists only the first 100 problems while counting all", async () => {
    const bad = await parseReadings(file("Time,Temp\n2026-03-01 10:00,20\n"), { ...base, humidityColumn: "Humidity" }, { now: NOW });
    expect(bad).toEqual({ ok: false, message: 'The file has no column called "Humidity" for the humidity.', field: "humidityColumn" });
    const many = await read(`Time,Temp,RH\n${Array.from({ length: 250 }, () => "x,1,1").join("\n")}`);
    expect(many).toMatchObject({ rows: 250, bad: 250 });
    expect(many.problems).toHaveLength(100);
    expect(many.problems[99]!.line).toBe(101);
  });

  it("keeps line numbers right across pieces and quoted line breaks, and reports progress", async () => {
    const lines = Array.from({ length: 12_000 }, (_, i) => `${new Date(Date.UTC(2026, 0, 1) + i * 60_000).toISOString()},${(i % 300) / 10},50`);
    lines[7_000] = '"2026-01-05\n10:00",20,50';
    const seen: number[] = [];
    const result = await parseReadings(file(`Time,Temp,RH\n${lines.join("\n")}\n`), base, { now: NOW, onProgress: (done) => void seen.push(done) });
    if (!result.ok) throw new Error(result.message);
    expect(result.problems).toEqual([{ line: 7003, message: 'time "2026-01-05\n10:00" is not in the format YYYY-MM-DD HH:mm[:ss]' }]);
    expect(result.good).toBe(11_999);
    expect(result.minutes.minute).toHaveLength(11_999);
    expect(seen.length).toBeGreaterThanOrEqual(3);
    expect(seen.at(-1)).toBe(12_000);
  });
});

describe("the form's guesses", () => {
  it("guesses columns, format, unit and decimal from the start of a file", () => {
    const f = file("No.;Date/Time;Temperature (°F);Humidity (%)\n1;14.03.2026 18:05;68,5;61,0\n2;14.03.2026 18:06;68,4;61,2\n");
    expect(guessOptions(f, sampleRows(f))).toEqual({ timeColumn: "Date/Time", temperatureColumn: "Temperature (°F)", humidityColumn: "Humidity (%)", dateFormat: "dmy_dot", unit: "f", decimal: "," });
    const us = file("timestamp,temp_c\n03/14/2026 18:05,20.5\n03/15/2026 18:05,20.5\n");
    expect(guessOptions(us, sampleRows(us))).toMatchObject({ timeColumn: "timestamp", temperatureColumn: "temp_c", humidityColumn: "", dateFormat: "mdy_slash", unit: "c", decimal: "." });
  });
});

describe("a logger's own export (tests/fixtures/readings-import)", () => {
  it("reads a BOM, CRLF, semicolon, decimal-comma file across the night the clocks go back in Berlin", async () => {
    // Europe/Berlin, 25 October 2026: 03:00 CEST back to 02:00 CET at 01:00 UTC (IANA
    // tz database, "europe" file, Rule EU), so 02:00–02:59 happens twice.
    const bytes = new Uint8Array(readFileSync(path.join(process.cwd(), "tests/fixtures/readings-import/logger-berlin-clocks-back.csv")));
    const checked = readCsvFile(bytes);
    if (!checked.ok) throw new Error(checked.message);
    const guess = guessOptions(checked, sampleRows(checked));
    expect(guess).toEqual({ timeColumn: "Datum Uhrzeit", temperatureColumn: "Temperatur[°C]", humidityColumn: "Luftfeuchte[%RH]", dateFormat: "dmy_dot", unit: "c", decimal: "," });
    const result = await parseReadings(checked, { ...guess, timeZone: "Europe/Berlin" }, { now: NOW });
    if (!result.ok) throw new Error(result.message);
    expect(result).toMatchObject({ rows: 7, good: 7, bad: 0, repeatedHour: { rows: 4, dates: ["2026-10-25"] } });
    expect(result.minutes.minute.map((m) => new Date(m).toISOString().slice(0, 16))).toEqual([
      "2026-10-24T23:30",
      "2026-10-25T00:00",
      "2026-10-25T00:30",
      "2026-10-25T01:00",
      "2026-10-25T01:30",
      "2026-10-25T02:00",
      "2026-10-25T02:30",
    ]);
    expect(result.minutes.mean).toEqual([6.4, 6.1, 5.9, 5.7, 5.6, 5.5, -0.5]);
    expect(result.minutes.rhMean.at(-1)).toBe(93);
  });
});
