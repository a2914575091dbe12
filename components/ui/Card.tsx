import type { HTMLAttributes, ReactNode } from "react";

type CardProps = {
  children: ReactNode;
  className?: string;
  as?: "div" | "section" | "article" | "li";
} & Omit<HTMLAttributes<HTMLElement>, "className" | "children">;

export function Card({ children, className = "", as: Tag = "div", ...rest }: CardProps) {
  return (
    <Tag className={`rounded-card border border-frost-200 bg-white shadow-sm ${className}`.trim()} {...rest}>
      {children}
    </Tag>
  );
}
