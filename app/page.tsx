import { headers } from "next/headers";
import { redirect } from "next/navigation";
import { SignOutButton } from "@/components/auth/SignOutButton";
import { Wordmark } from "@/components/brand/Wordmark";
import { NewSiteForm } from "@/components/site/NewSiteForm";
import { Card } from "@/components/ui/Card";
import { getSitesForUser } from "@/db/queries/sites";
import { getSessionUser } from "@/lib/server/session";

export default async function HomePage() {
  const user = await getSessionUser(await headers());
  if (!user) redirect("/sign-in");

  const [first] = await getSitesForUser({ userId: user.id });
  if (first) redirect(`/sites/${first.slug}`);

  return (
    <div className="min-h-dvh">
      <header className="border-b border-frost-200 bg-white">
        <div className="mx-auto flex max-w-3xl items-center justify-between gap-3 px-4 py-2">
          <Wordmark />
          <div className="flex items-center gap-2 text-sm text-frost-700">
            <span className="hidden sm:inline">{user.name}</span>
            <SignOutButton />
          </div>
        </div>
      </header>
      <main className="mx-auto flex max-w-xl flex-col gap-6 px-4 py-10">
        <div>
          <h1 className="text-2xl font-semibold text-frost-950">No site yet</h1>
          <p className="mt-2 text-frost-700">
            A site is the place where your houses stand: a garden, an allotment, a nursery. You don’t belong to one yet.
            Create one below, or ask the owner of an existing site to add you to it.
          </p>
        </div>
        <Card as="section" className="p-5 sm:p-7" aria-labelledby="new-site-title">
          <h2 id="new-site-title" className="mb-4 text-lg font-semibold text-frost-950">
            Create a site
          </h2>
          <NewSiteForm />
        </Card>
      </main>
    </div>
  );
}
