/**
 * CSV uploads (readings, journal) are read and checked on the request thread: a full 1 MB file
 * takes about 0.1 s there (0.3 s cold). A file with a bad row stores nothing, so no quota ever
 * stopped it, and uploads in a loop kept the request thread reading (issue 10). So each person
 * has a number of uploads a minute, readings and journal together, counted before the body is
 * read. (Reading them on the worker pool would take them off the request thread entirely.)
 */
import { LIMITS, take, waitText } from "~/rate-limits.server";

/** An upload refused before it was read: 429 and what to do. */
export class UploadRefused extends Error {
  readonly status = 429;
  override name = "UploadRefused";
}

/** Counts one upload of the person, or throws UploadRefused past the limit. */
export async function takeUploadTurn(userId: number): Promise<void> {
  const wait = await take("uploadsPerPerson", `user:${userId}`);
  if (wait > 0) {
    throw new UploadRefused(
      `Too many uploads: at most ${LIMITS.uploadsPerPerson.points} a minute. Try again in ${waitText(wait)}.`,
    );
  }
}
