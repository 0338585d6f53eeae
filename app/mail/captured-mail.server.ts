import fs from "node:fs";
import path from "node:path";

/** One message caught by the local fake SMTP server. */
export type CapturedMail = {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string;
  links: string[];
  /** Header lines keyed in lower case (absent in mail captured before headers were kept). */
  headers?: Record<string, string>;
};

export function extractLinks(body: string): string[] {
  const found = body.match(/https?:\/\/[^\s"'<>)]+/g) ?? [];
  return [...new Set(found)];
}

/** Captured messages, newest first; an absent folder is an empty list. */
export function listCapturedMail(captureDir: string): CapturedMail[] {
  if (!fs.existsSync(captureDir)) return [];
  return fs
    .readdirSync(captureDir)
    .filter((f) => f.endsWith(".json"))
    .map((f) => JSON.parse(fs.readFileSync(path.join(captureDir, f), "utf8")) as CapturedMail)
    .sort((a, b) => b.receivedAt.localeCompare(a.receivedAt) || b.id.localeCompare(a.id));
}
