// Money and energy as the tariff and bill pages write them, in the site's currency.

const moneyFormats = new Map<string, Intl.NumberFormat>();
const priceFormats = new Map<string, Intl.NumberFormat>();

function format(cache: Map<string, Intl.NumberFormat>, currency: string, options: Intl.NumberFormatOptions) {
  let f = cache.get(currency);
  if (!f) cache.set(currency, (f = new Intl.NumberFormat("en-GB", { style: "currency", currency, ...options })));
  return f;
}

/** "£612.40": an amount in the currency's usual places. */
export function formatMoney(value: number, currency: string): string {
  return format(moneyFormats, currency, {}).format(value);
}

/** "£0.285": a unit price, with the places a tariff quotes (up to 4 beyond the usual). */
export function formatUnitPrice(value: number, currency: string): string {
  return format(priceFormats, currency, { maximumFractionDigits: 5 }).format(value);
}

const kwhFormat = new Intl.NumberFormat("en-GB", { maximumFractionDigits: 1 });

/** "1,840.5": kWh to a tenth. */
export function formatNumber(value: number): string {
  return kwhFormat.format(value);
}

/** "1,840.5 kWh" */
export function formatKwh(value: number): string {
  return `${formatNumber(value)} kWh`;
}

/** "£" for GBP, "CHF" where the currency has no sign of its own. */
export function currencySymbol(currency: string): string {
  return format(moneyFormats, currency, {}).formatToParts(0).find((p) => p.type === "currency")?.value ?? currency;
}
