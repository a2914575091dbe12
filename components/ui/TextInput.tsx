import type { ComponentPropsWithRef } from "react";

export const controlClasses =
  "block min-h-11 w-full rounded-lg border border-frost-300 bg-white px-3 text-base text-frost-900 shadow-xs placeholder:text-frost-400 focus:border-leaf-600 focus:outline-none focus:ring-2 focus:ring-leaf-600/25 aria-invalid:border-ember-500 aria-invalid:focus:ring-ember-500/25 sm:text-sm";

export function TextInput({ className = "", ...rest }: ComponentPropsWithRef<"input">) {
  return <input className={`${controlClasses} ${className}`.trim()} {...rest} />;
}
