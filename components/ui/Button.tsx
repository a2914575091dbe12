import type { ButtonHTMLAttributes } from "react";

export type ButtonVariant = "primary" | "secondary" | "quiet";

const base =
  "inline-flex min-h-11 items-center justify-center gap-2 rounded-lg px-4 text-sm font-semibold transition-colors disabled:cursor-not-allowed disabled:opacity-60";

const variants: Record<ButtonVariant, string> = {
  primary: "bg-leaf-700 text-white hover:bg-leaf-800 active:bg-leaf-900",
  secondary: "border border-frost-300 bg-white text-frost-900 hover:bg-frost-100",
  quiet: "text-frost-700 hover:bg-frost-100 hover:text-frost-900",
};

/** The classes of a button, for links that should look like one. */
export function buttonClasses(variant: ButtonVariant = "primary", extra = ""): string {
  return `${base} ${variants[variant]} ${extra}`.trim();
}

type ButtonProps = ButtonHTMLAttributes<HTMLButtonElement> & {
  variant?: ButtonVariant;
  /** Disables the button and shows `pendingLabel` while work is in flight. */
  pending?: boolean;
  pendingLabel?: string;
};

export function Button({ variant = "primary", pending = false, pendingLabel, className = "", disabled, children, type = "button", ...rest }: ButtonProps) {
  return (
    <button type={type} className={buttonClasses(variant, className)} disabled={disabled || pending} aria-busy={pending || undefined} {...rest}>
      {pending && pendingLabel ? pendingLabel : children}
    </button>
  );
}
