import type { ComponentPropsWithRef } from "react";
import { Select } from "@/components/ui/Select";

export const CURRENCY_CHOICES = [
  ["GBP", "Pound sterling"],
  ["EUR", "Euro"],
  ["USD", "US dollar"],
  ["CAD", "Canadian dollar"],
  ["AUD", "Australian dollar"],
  ["NZD", "New Zealand dollar"],
  ["CHF", "Swiss franc"],
  ["SEK", "Swedish krona"],
  ["NOK", "Norwegian krone"],
  ["DKK", "Danish krone"],
  ["PLN", "Polish złoty"],
  ["CZK", "Czech koruna"],
  ["JPY", "Japanese yen"],
  ["INR", "Indian rupee"],
  ["ZAR", "South African rand"],
] as const;

export const DEFAULT_CURRENCY = "GBP";

export function CurrencySelect(props: Omit<ComponentPropsWithRef<"select">, "children">) {
  return (
    <Select {...props}>
      {CURRENCY_CHOICES.map(([code, name]) => (
        <option key={code} value={code}>
          {code} — {name}
        </option>
      ))}
    </Select>
  );
}
