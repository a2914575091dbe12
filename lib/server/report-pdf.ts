// The printable report for a bill period: the site, the period, the tariffs, the
// totals, a chart of runtime and cost, and a table per house. pdfkit's built-in
// Helvetica: nothing is fetched or embedded.
import PDFDocument from "pdfkit";
import type { EnergyReport } from "@/lib/energy/report";
import { formatMoney, formatUnitPrice } from "@/lib/tariffs/money";

type PdfReport = EnergyReport & { siteName: string; zone: string; currency: string };

const INK = "#1f2a24";
const MUTED = "#5b6660";
const BAR = "#3f7d4f";
const RULE = "#c9d2cc";

function formatters(currency: string) {
  const n = (digits: number) => new Intl.NumberFormat("en-GB", { minimumFractionDigits: digits, maximumFractionDigits: digits });
  return {
    money: (v: number | null) => (v === null ? "–" : formatMoney(v, currency)),
    hours: (v: number) => n(1).format(v),
    kwh: (v: number | null) => (v === null ? "–" : n(2).format(v)),
    price: (v: number) => formatUnitPrice(v, currency),
  };
}

const longDate = (day: string) => new Date(`${day}T12:00:00Z`).toLocaleDateString("en-GB", { day: "numeric", month: "long", year: "numeric", timeZone: "UTC" });

/** Renders the report; resolves with the PDF's bytes. */
export function renderReportPdf(report: PdfReport, { title, madeAt }: { title: string; madeAt: Date }): Promise<Buffer> {
  const f = formatters(report.currency);
  const doc = new PDFDocument({ size: "A4", margin: 48, info: { Title: `${title} — ${report.siteName}`, Creator: "Cloche" } });
  const chunks: Buffer[] = [];
  doc.on("data", (c: Buffer) => chunks.push(c));
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on("end", () => resolve(Buffer.concat(chunks)));
    doc.on("error", reject);
  });

  const left = doc.page.margins.left;
  const width = doc.page.width - doc.page.margins.left - doc.page.margins.right;

  doc.fillColor(INK).font("Helvetica-Bold").fontSize(18).text(report.siteName);
  doc.font("Helvetica").fontSize(12).fillColor(MUTED).text(`${title}: ${longDate(report.fromDay)} to ${longDate(report.toDay)} (${report.zone})`);
  doc.moveDown(0.8);

  // Totals
  const s = report.site;
  const totals: [string, string][] = [
    ["Heating and other plugs, runtime", `${f.hours(s.onHours)} h`],
    ["Energy from rated power", `${f.kwh(s.ratedKwh)} kWh`],
    ["Energy metered by the plugs", s.meteredKwh === null ? "no plug meters energy" : `${f.kwh(s.meteredKwh)} kWh`],
    ["Energy costed (metered where a plug meters, rated otherwise)", `${f.kwh(s.costedKwh)} kWh`],
    ["Energy cost, tax included", f.money(s.cost)],
    [`Standing charges, ${report.daysElapsed} days, tax included`, f.money(s.standingCharge)],
    ["Total, tax included", f.money(s.total)],
    ["of which tax", f.money(s.tax)],
  ];
  doc.fillColor(INK).font("Helvetica-Bold").fontSize(13).text("Totals");
  doc.moveDown(0.3);
  for (const [label, value] of totals) row(doc, left, width, [label, value], [0.7, 0.3], label.startsWith("Total") ? "Helvetica-Bold" : "Helvetica");
  if (s.unpricedKwh > 0) {
    doc.moveDown(0.3).fillColor(MUTED).fontSize(9).text(`${f.kwh(s.unpricedKwh)} kWh fell on days no tariff covers and are not costed.`, left, doc.y, { width });
  }
  doc.moveDown(0.8);

  // Tariffs
  doc.fillColor(INK).font("Helvetica-Bold").fontSize(13).text("Tariffs", left);
  doc.moveDown(0.3);
  if (report.tariffs.length === 0) doc.font("Helvetica").fontSize(10).fillColor(MUTED).text("No tariff covers this period.", left);
  for (const t of report.tariffs) {
    doc
      .font("Helvetica")
      .fontSize(10)
      .fillColor(INK)
      .text(
        `${t.name}: ${longDate(t.fromDay)} to ${longDate(t.toDay)} (${t.days} days), standing charge ${f.price(t.standingChargePerDay)} a day, tax ${t.taxPercent} %`,
        left,
        doc.y,
        { width },
      );
  }
  for (const r of report.rates) row(doc, left, width, [`  ${r.tariff}, ${r.label} at ${f.price(r.pricePerKwh)}/kWh`, `${f.kwh(r.costedKwh)} kWh`, f.money(r.cost)], [0.6, 0.2, 0.2]);
  doc.moveDown(0.8);

  // Chart: runtime per bucket
  chart(doc, report, left, width, f);

  // Houses
  for (const house of report.houses) {
    if (doc.y > doc.page.height - 160) doc.addPage();
    doc.moveDown(0.6).fillColor(INK).font("Helvetica-Bold").fontSize(13).text(house.name, left);
    doc.moveDown(0.2);
    const widths = [0.34, 0.13, 0.15, 0.15, 0.23];
    row(doc, left, width, ["Plug", "Runtime h", "Rated kWh", "Metered kWh", "Cost"], widths, "Helvetica-Bold", MUTED);
    for (const p of house.plugs) {
      row(doc, left, width, [p.name + (p.retired ? " (retired)" : ""), f.hours(p.onHours), f.kwh(p.ratedKwh), f.kwh(p.meteredKwh), f.money(p.cost)], widths);
    }
    row(doc, left, width, ["House total", f.hours(house.onHours), f.kwh(house.ratedKwh), f.kwh(house.meteredKwh), f.money(house.cost)], widths, "Helvetica-Bold");
  }

  doc.moveDown(1.2).font("Helvetica").fontSize(8).fillColor(MUTED);
  doc.text(
    `Made by Cloche on ${madeAt.toISOString().slice(0, 16).replace("T", " ")} UTC. Runtime comes from the switch log; energy from rated power is rated watts × hours on. Costs are worked from the tariffs entered in Cloche and may differ from the supplier's bill.`,
    left,
    doc.y,
    { width },
  );
  doc.end();
  return done;
}

function row(doc: PDFKit.PDFDocument, left: number, width: number, cells: string[], widths: number[], font = "Helvetica", colour = INK) {
  const y = doc.y;
  let x = left;
  doc.font(font).fontSize(10).fillColor(colour);
  let bottom = y;
  cells.forEach((cell, i) => {
    const w = width * widths[i]!;
    doc.text(cell, x, y, { width: w - 6, align: i === 0 ? "left" : "right" });
    bottom = Math.max(bottom, doc.y);
    x += w;
  });
  doc
    .moveTo(left, bottom + 2)
    .lineTo(left + width, bottom + 2)
    .lineWidth(0.5)
    .strokeColor(RULE)
    .stroke();
  doc.x = left;
  doc.y = bottom + 5;
}

function chart(doc: PDFKit.PDFDocument, report: PdfReport, left: number, width: number, f: ReturnType<typeof formatters>) {
  const series = report.series;
  if (series.length === 0) return;
  if (doc.y > doc.page.height - 230) doc.addPage();
  doc.fillColor(INK).font("Helvetica-Bold").fontSize(13).text(`Runtime by ${report.bucket}, hours`, left);
  const top = doc.y + 8;
  const height = 130;
  const max = Math.max(1, ...series.map((b) => b.onHours));
  const slot = width / series.length;
  const barWidth = Math.max(1, slot * 0.7);
  doc.lineWidth(0.5).strokeColor(RULE).moveTo(left, top + height).lineTo(left + width, top + height).stroke();
  series.forEach((b, i) => {
    const h = (b.onHours / max) * height;
    if (h > 0) doc.rect(left + i * slot + (slot - barWidth) / 2, top + height - h, barWidth, h).fill(BAR);
  });
  doc.font("Helvetica").fontSize(8).fillColor(MUTED);
  doc.text(`${f.hours(max)} h`, left, top - 2, { width: 60 });
  doc.text(series[0]!.fromDay, left, top + height + 3, { width: 80 });
  doc.text(series[series.length - 1]!.toDay, left + width - 80, top + height + 3, { width: 80, align: "right" });
  doc.x = left;
  doc.y = top + height + 18;
}
