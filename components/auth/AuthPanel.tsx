import Link from "next/link";
import type { ReactNode } from "react";
import { Wordmark } from "@/components/brand/Wordmark";
import { Card } from "@/components/ui/Card";

type AuthPanelProps = {
  title: string;
  intro: string;
  children: ReactNode;
  footer: ReactNode;
};

/** The frame of the sign-in and sign-up pages. */
export function AuthPanel({ title, intro, children, footer }: AuthPanelProps) {
  return (
    <main className="mx-auto flex min-h-dvh w-full max-w-md flex-col justify-center gap-6 px-4 py-10">
      {/* Not prefetched: signed out, "/" answers with a redirect the router would keep after sign-in. */}
      <Link href="/" prefetch={false} className="self-center">
        <Wordmark />
      </Link>
      <Card as="section" className="p-5 sm:p-7" aria-labelledby="auth-title">
        <h1 id="auth-title" className="text-xl font-semibold text-frost-950">
          {title}
        </h1>
        <p className="mt-1 mb-6 text-sm text-frost-600">{intro}</p>
        {children}
      </Card>
      <p className="text-center text-sm text-frost-700">{footer}</p>
    </main>
  );
}
