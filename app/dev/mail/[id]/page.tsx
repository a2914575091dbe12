import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { Card } from "@/components/ui/Card";
import { readMail } from "@/lib/server/mailbox";
import { mailSinkFolder } from "../sink";

export const metadata: Metadata = { title: "A message kept by the local sink", robots: { index: false }, referrer: "no-referrer" };
export const dynamic = "force-dynamic";

type Props = { params: Promise<{ id: string }> };

/** The message's plain text with its web links made clickable (its HTML is not rendered). */
function Linked({ text }: { text: string }) {
  const parts = text.split(/(https?:\/\/[^\s<>"]+)/g);
  return (
    <>
      {parts.map((part, i) =>
        i % 2 === 1 ? (
          <a key={i} href={part} className="break-all font-semibold text-leaf-700 underline">
            {part}
          </a>
        ) : (
          part
        ),
      )}
    </>
  );
}

export default async function DevMailMessagePage({ params }: Props) {
  const message = await readMail(mailSinkFolder(), (await params).id);
  if (!message) notFound();
  return (
    <main className="mx-auto flex max-w-3xl flex-col gap-6 px-4 py-8">
      <Link href="/dev/mail" className="inline-flex min-h-11 items-center text-sm font-semibold text-leaf-700">
        ← All mail
      </Link>
      <Card as="article" className="p-4 sm:p-6" aria-labelledby="subject">
        <h1 id="subject" className="text-xl font-semibold text-frost-950">
          {message.subject}
        </h1>
        <dl className="mt-3 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
          <dt className="text-frost-600">From</dt>
          <dd className="text-frost-900">{message.from}</dd>
          <dt className="text-frost-600">To</dt>
          <dd className="text-frost-900">{message.to.join(", ")}</dd>
          <dt className="text-frost-600">Received</dt>
          <dd className="text-frost-900">{message.receivedAt.toISOString()}</dd>
        </dl>
        <div className="mt-5 text-base leading-relaxed whitespace-pre-wrap text-frost-900">
          <Linked text={message.text} />
        </div>
      </Card>
    </main>
  );
}
