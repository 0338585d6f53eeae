/** Sentences about classes shown both by the server (errors) and on the pages. */
export const READ_ONLY_CLASS =
  "You are no longer an educator, so this class is read-only. An admin can hand it to another educator.";
