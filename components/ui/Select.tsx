import type { ComponentPropsWithRef } from "react";
import { controlClasses } from "./TextInput";

export function Select({ className = "", ...rest }: ComponentPropsWithRef<"select">) {
  return <select className={`${controlClasses} pr-8 ${className}`.trim()} {...rest} />;
}
