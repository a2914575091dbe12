import type { Metadata } from "next";
import { headers } from "next/headers";
import Link from "next/link";
import { redirect } from "next/navigation";
import { AuthPanel } from "@/components/auth/AuthPanel";
import { SignUpForm } from "@/components/auth/SignUpForm";
import { getSessionUser } from "@/lib/server/session";

export const metadata: Metadata = { title: "Create an account" };

export default async function SignUpPage() {
  if (await getSessionUser(await headers())) redirect("/");
  return (
    <AuthPanel
      title="Create your account"
      intro="One account for you, and a first site for your houses."
      footer={
        <>
          Already have an account?{" "}
          <Link href="/sign-in" className="font-semibold text-leaf-700 underline-offset-2 hover:underline">
            Sign in
          </Link>
        </>
      }
    >
      <SignUpForm />
    </AuthPanel>
  );
}
