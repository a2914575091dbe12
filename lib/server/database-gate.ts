import "server-only";
import { getPool } from "@/db/client";

// Pages ask this before they render: a page whose database does not answer gets a
// plain 503 in about two seconds, instead of failing part-way through its render.
// One answer serves every page asked for within a second.
const ANSWER_WITHIN_MS = 2000;
const KEEP_ANSWER_MS = 1000;

let last: { atMs: number; answers: boolean } | null = null;
let asking: Promise<boolean> | null = null;

function ask(): Promise<boolean> {
  return new Promise<boolean>((resolve) => {
    const timer = setTimeout(() => resolve(false), ANSWER_WITHIN_MS);
    getPool()
      .query("SELECT 1")
      .then(
        () => resolve(true),
        () => resolve(false),
      )
      .finally(() => clearTimeout(timer));
  });
}

export async function databaseAnswers(): Promise<boolean> {
  if (last && Date.now() - last.atMs < KEEP_ANSWER_MS) return last.answers;
  asking ??= ask().then((answers) => {
    last = { atMs: Date.now(), answers };
    asking = null;
    return answers;
  });
  return asking;
}
