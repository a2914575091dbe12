import { toNextJsHandler } from "better-auth/next-js";
import { AppError, DATABASE_UNAVAILABLE_MESSAGE } from "@/lib/errors";
import { getAuth } from "@/lib/server/auth";
import { databaseAnswers } from "@/lib/server/database-gate";
import { errorResponse } from "@/lib/server/http";

// The sign-in library answers any failure of its own with a 500; when the database is
// the reason, the person is told so (a 503 in the one error shape) instead.
async function handle(request: Request): Promise<Response> {
  const response = await getAuth().handler(request);
  if (response.status >= 500 && !(await databaseAnswers())) {
    return errorResponse(new AppError("unavailable", DATABASE_UNAVAILABLE_MESSAGE));
  }
  return response;
}

export const { GET, POST } = toNextJsHandler(handle);
