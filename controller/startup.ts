// At start-up MariaDB may still be coming up: try again with back-off for a while.
import type { Logger } from "pino";

export async function untilDatabaseAnswers(logger: Logger, work: () => Promise<void>, attempts = 30) {
  for (let attempt = 0; ; attempt++) {
    try {
      return await work();
    } catch (error) {
      if (attempt >= attempts) throw error;
      logger.warn({ err: error, attempt }, "MariaDB not ready; retrying");
      await new Promise((resolve) => setTimeout(resolve, Math.min(5000, 200 * 2 ** attempt)));
    }
  }
}
