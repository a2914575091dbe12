// Which day a daily summary covers, by its time: kept apart from the summary's wording
// so the settings form can say it without loading the rest.

/** A summary time before this hour covers yesterday; from it on, the day so far. */
export const YESTERDAY_BEFORE_HOUR = 12;

/** What a summary sent at this time (HH:MM) covers, in words for the settings pages. */
export function summaryCovers(time: string): string {
  return Number(time.slice(0, 2)) < YESTERDAY_BEFORE_HOUR ? "yesterday, the whole day" : "today so far";
}
