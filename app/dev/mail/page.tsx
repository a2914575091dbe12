import type { Metadata } from "next";
import Link from "next/link";
import { Card } from "@/components/ui/Card";
import { listMail } from "@/lib/server/mailbox";
import { mailSinkFolder } from "./sink";

export const metadata: Metadata = { title: "Mail kept by the local sink", robots: { index: false } };
export const dynamic = "force-dynamic";

const when = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", hour: "2-digit", minute: "2-digit", second: "2-digit", hourCycle: "h23" });

export default async function DevMailPage() {
  const messages = await listMail(mailSinkFolder());
  return (
    <main className="mx-auto flex max-w-3xl flex-col gap-6 px-4 py-8">
      <div>
        <h1 className="text-2xl font-semibold text-frost-950">Mail kept by the local sink</h1>
        <p className="mt-1 text-sm text-frost-600">
          In development Cloche sends its e-mail to a local SMTP sink, which keeps it here instead of delivering it. Newest first.
        </p>
      </div>
      <Card as="section" className="p-4 sm:p-6" aria-label="Messages">
        {messages.length === 0 ? (
          <p className="text-sm text-frost-700">No mail yet.</p>
        ) : (
          <ul className="divide-y divide-frost-200">
            {messages.map((m) => (
              <li key={m.id}>
                <Link href={`/dev/mail/${m.id}`} className="flex min-h-11 flex-col py-3 hover:bg-frost-50">
                  <span className="font-semibold text-leaf-800">{m.subject}</span>
                  <span className="text-sm text-frost-700">
                    to {m.to.join(", ")} · {when.format(m.receivedAt)}
                  </span>
                </Link>
              </li>
            ))}
          </ul>
        )}
      </Card>
    </main>
  );
}
