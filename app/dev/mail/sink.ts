import "server-only";
import { notFound } from "next/navigation";
import { env } from "@/lib/server/env";

/**
 * The local sink's folder, or a 404: the mail pages exist only where CLOCHE_MAIL_SINK_DIR
 * is set (npm start, npm test), never in a deployment that sends real mail.
 */
export function mailSinkFolder(): string {
  const folder = env().CLOCHE_MAIL_SINK_DIR;
  if (!folder) notFound();
  return folder;
}
