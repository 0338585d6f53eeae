/**
 * Whole listings of what a person stores — the journal and readings as CSV files or through the
 * API — are built on the request thread: a full journal or 20,000 readings take 0.2–0.7 s there,
 * and nothing stopped one person from asking again and again (issue 10). So each person has a
 * number of them a minute, counted before the work.
 */
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

/** The answer of a file download refused: plain text, with Retry-After. */
export function listingRefusedResponse(error: ListingRefused): Response {
  return new Response(error.message, {
    status: 429,
    headers: {
      "Content-Type": "text/plain; charset=utf-8",
      "Retry-After": String(error.waitSeconds),
      "Cache-Control": "no-store",
    },
  });
}
