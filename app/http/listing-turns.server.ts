/**
 * Whole listings of what a person stores — the journal and readings as CSV files or through the
 * API — are costly: a full journal or 20,000 readings take 0.1–0.7 s (the rows are read on the
 * request thread; a CSV is written on the chores thread, the API's JSON on the request thread),
 * and nothing stopped one person from asking again and again (issue 10). So each person has a
 * number of them a minute, counted before the work.
 */
import { plainText } from "~/http/downloads.server";
import { LIMITS, take, waitText } from "~/rate-limits.server";

/** A whole listing refused before it was built: 429 and when to ask again. */
export class ListingRefused extends Error {
  readonly status = 429;
  override name = "ListingRefused";
  constructor(readonly waitSeconds: number) {
    super(
      `Too many whole exports or listings: at most ${LIMITS.fullListingsPerPerson.points} a minute. Try again in ${waitText(waitSeconds)}.`,
    );
  }
}

/** Counts one whole listing of the person, or throws ListingRefused past the limit. */
export async function takeListingTurn(userId: number): Promise<void> {
  const wait = await take("fullListingsPerPerson", `user:${userId}`);
  if (wait > 0) throw new ListingRefused(wait);
}

/** For a file download: counts one whole listing, or answers the refusal (429, plain text, Retry-After); null to go on. */
export async function downloadTurn(userId: number): Promise<Response | null> {
  try {
    await takeListingTurn(userId);
    return null;
  } catch (error) {
    if (error instanceof ListingRefused)
      return plainText(error.message, 429, { "Retry-After": String(error.waitSeconds) });
    throw error;
  }
}
