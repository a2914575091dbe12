import type { Metadata } from "next";
import { headers } from "next/headers";
import Link from "next/link";
import { redirect } from "next/navigation";
import { AuthPanel } from "@/components/auth/AuthPanel";
import { SignInForm } from "@/components/auth/SignInForm";
import { getSessionUser } from "@/lib/server/session";

export const metadata: Metadata = { title: "Sign in" };

type Props = { searchParams: Promise<{ next?: string | string[] }> };

/** Where to go after signing in: a path of this app only (an invitation's page, say). */
function localPath(next: string | string[] | undefined): string {
  return typeof next === "string" && /^\/(?![/\\])/.test(next) ? next : "/";
}

export default async function SignInPage({ searchParams }: Props) {
  const next = localPath((await searchParams).next);
  if (await getSessionUser(await headers())) redirect(next);
  return (
    <AuthPanel
      title="Sign in"
      intro="Welcome back. Your houses are where you left them."
      footer={
        <>
          New to Cloche?{" "}
          <Link href="/sign-up" className="font-semibold text-leaf-700 underline-offset-2 hover:underline">
            Create an account
          </Link>
        </>
      }
    >
      <SignInForm next={next} />
    </AuthPanel>
  );
}
