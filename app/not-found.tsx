import Link from "next/link";
import { Wordmark } from "@/components/brand/Wordmark";
import { buttonClasses } from "@/components/ui/Button";

export default function NotFound() {
  return (
    <main className="mx-auto flex min-h-dvh max-w-md flex-col items-center justify-center gap-4 px-4 text-center">
      <Wordmark />
      <h1 className="text-2xl font-semibold text-frost-950">Nothing grows here</h1>
      <p className="text-frost-700">
        This page doesn’t exist, or it belongs to a site you are not a member of.
      </p>
      <Link href="/" className={buttonClasses("primary")}>
        Back to your houses
      </Link>
    </main>
  );
}
