/** File downloads from the route edge: a CSV as an attachment, and a plain-text answer instead of one. */

/** `csv` as a download named `fileName`; the byte-order mark makes spreadsheet programs read it as UTF-8. */
export function csvAttachment(csv: string, fileName: string): Response {
  return new Response("\uFEFF" + csv, {
    headers: {
      "Content-Type": "text/csv; charset=utf-8",
      "Content-Disposition": `attachment; filename="${fileName}"`,
      "Cache-Control": "no-store",
    },
  });
}

/** A sentence instead of the file: why there is none (a limit, nothing to export). */
export function plainText(message: string, status: number, headers: Record<string, string> = {}): Response {
  return new Response(message, {
    status,
    headers: { "Content-Type": "text/plain; charset=utf-8", "Cache-Control": "no-store", ...headers },
  });
}
