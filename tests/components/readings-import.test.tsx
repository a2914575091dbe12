// The import form: the file's columns and formats guessed from its start, the options
// sent in the query with the file as the body (msw stands in for the handlers), the
// preview's counts and bad lines, and the import offered only when every row reads.
import { cleanup, fireEvent, render, screen, waitFor, within } from "@testing-library/react";
import { http, HttpResponse } from "msw";
import { setupServer } from "msw/node";
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from "vitest";
import { ReadingImport } from "@/components/readings-import/ReadingImport";
import { TemperatureUnitProvider } from "@/components/site/TemperatureUnit";

const refresh = vi.fn();
vi.mock("next/navigation", () => ({ useRouter: () => ({ push: vi.fn(), refresh }) }));

const SITE = "5b1e7c1a-1111-4c4c-8888-000000000021";
const SENSOR = "5b1e7c1a-1111-4c4c-8888-000000000022";
const OUTSIDE = "5b1e7c1a-1111-4c4c-8888-000000000023";
const FILE = "Nr;Datum/Zeit;Temperatur °F;Feuchte %\r\n1;10.01.2026 09:00:00;50,0;60,5\r\n2;10.01.2026 09:01:00;50,9;61,0\r\n";
const sent: { url: URL; body: string }[] = [];

const previewOf = (bad: number) => ({
  type: "result",
  status: 200,
  fileName: "logger.csv",
  rows: 2,
  good: 2 - bad,
  bad,
  problems: bad ? [{ line: 3, message: 'temperature "warm" is not a number' }] : [],
  preview: [
    { line: 2, time: "10.01.2026 09:00:00", at: Date.UTC(2026, 0, 10, 9), tempC: 10, rh: 60.5, problem: null },
    { line: 3, time: "10.01.2026 09:01:00", at: bad ? null : Date.UTC(2026, 0, 10, 9, 1), tempC: bad ? null : 10.5, rh: 61, problem: bad ? 'temperature "warm" is not a number' : null },
  ],
  minutes: 2 - bad,
  newMinutes: 2 - bad,
  minutesAlreadyThere: 0,
  firstAt: Date.UTC(2026, 0, 10, 9),
  lastAt: Date.UTC(2026, 0, 10, 9, bad ? 0 : 1),
  note: null,
});
let bad = 0;
const lines = (...objects: unknown[]) => new HttpResponse(objects.map((o) => JSON.stringify(o)).join("\n") + "\n", { headers: { "content-type": "application/x-ndjson" } });

const server = setupServer(
  http.post(`*/api/sites/${SITE}/sensors/:sensor/import/preview`, async ({ request }) => {
    sent.push({ url: new URL(request.url), body: await request.text() });
    return lines({ type: "progress", stage: "reading", done: 2, total: 2 }, previewOf(bad));
  }),
  http.post(`*/api/sites/${SITE}/sensors/:sensor/import`, async ({ request }) => {
    sent.push({ url: new URL(request.url), body: await request.text() });
    return lines({ type: "progress", stage: "writing", done: 2, total: 2 }, { type: "result", status: 201, import: { rowsRead: 2, minutesAdded: 2, minutesAlreadyThere: 0, note: null } });
  }),
);

beforeAll(() => server.listen({ onUnhandledRequest: "error" }));
afterEach(() => {
  cleanup();
  sent.length = 0;
  bad = 0;
});
afterAll(() => server.close());

const sensors = [
  { id: SENSOR, name: "Bench air", houseName: "Propagation", placement: "inside" as const },
  { id: OUTSIDE, name: "North wall", houseName: "Propagation", placement: "outside" as const },
];

async function chooseFile() {
  render(
    <TemperatureUnitProvider unit="c">
      <ReadingImport siteId={SITE} siteZone="Europe/London" sensors={sensors} />
    </TemperatureUnitProvider>,
  );
  const input = screen.getByLabelText(/CSV file/);
  fireEvent.change(input, { target: { files: [new File([FILE], "logger.csv", { type: "text/csv" })] } });
  await waitFor(() => expect(screen.getByLabelText("Time column")).toBeTruthy());
}

const value = (label: string | RegExp) => (screen.getByLabelText(label) as HTMLSelectElement).value;

describe("ReadingImport", () => {
  it("guesses the mapping from the file's start and sends the chosen options with the file", async () => {
    await chooseFile();
    expect(value("Time column")).toBe("Datum/Zeit");
    expect(value("Temperature column")).toBe("Temperatur °F");
    expect(value("Humidity column")).toBe("Feuchte %");
    expect(value("How times are written")).toBe("dmy_dot");
    expect((screen.getByRole("radio", { name: "°F" }) as HTMLInputElement).checked).toBe(true);
    expect((screen.getByRole("radio", { name: /Comma/ }) as HTMLInputElement).checked).toBe(true);

    // The person picks the outside sensor and leaves out the humidity.
    fireEvent.change(screen.getByLabelText("Sensor"), { target: { value: OUTSIDE } });
    fireEvent.change(screen.getByLabelText("Humidity column"), { target: { value: "" } });
    fireEvent.click(screen.getByRole("button", { name: "Check the file" }));
    await waitFor(() => expect(screen.getByRole("heading", { name: "Preview of logger.csv" })).toBeTruthy());
    expect(sent).toHaveLength(1);
    expect(sent[0]!.url.pathname).toBe(`/api/sites/${SITE}/sensors/${OUTSIDE}/import/preview`);
    expect(Object.fromEntries(sent[0]!.url.searchParams)).toEqual({
      timeColumn: "Datum/Zeit",
      temperatureColumn: "Temperatur °F",
      humidityColumn: "",
      dateFormat: "dmy_dot",
      timeZone: "Europe/London",
      unit: "f",
      decimal: ",",
      fileName: "logger.csv",
    });
    expect(sent[0]!.body).toBe(FILE);

    // Every row reads: the import is offered, and its outcome shown.
    fireEvent.click(screen.getByRole("button", { name: "Import 2 new minutes" }));
    await waitFor(() => expect(screen.getByRole("status").textContent).toContain("2 new minutes added"));
    expect(sent[1]!.url.pathname).toBe(`/api/sites/${SITE}/sensors/${OUTSIDE}/import`);
    expect(refresh).toHaveBeenCalled();
  });

  it("lists the bad lines of the preview and offers no import", async () => {
    bad = 1;
    await chooseFile();
    fireEvent.click(screen.getByRole("button", { name: "Check the file" }));
    const alert = await screen.findByRole("alert");
    expect(alert.textContent).toContain("1 row needs fixing. Nothing is imported until every row reads");
    expect(within(alert).getByText('Line 3: temperature "warm" is not a number')).toBeTruthy();
    expect(screen.queryByRole("button", { name: /^Import/ })).toBeNull();
    // A changed option asks for a new check.
    fireEvent.click(screen.getByRole("radio", { name: "°C" }));
    expect(screen.queryByRole("heading", { name: /Preview/ })).toBeNull();
  });
});
