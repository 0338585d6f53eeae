/**
 * A local stand-in for a real mail service, for development, the demo and tests: an SMTP
 * server on loopback that accepts every message and writes it, parsed, as a JSON file into
 * a capture folder. The app sends to it through the same nodemailer path it uses in
 * production; only SMTP_URL differs. The /dev/mail page and the end-to-end tests read the
 * folder.
 */
import fs from "node:fs";
import path from "node:path";
import { simpleParser } from "mailparser";
import { SMTPServer } from "smtp-server";
import { type CapturedMail, extractLinks } from "~/mail/captured-mail.server";

export type FakeSmtp = { url: string; port: number; close: () => Promise<void> };

export async function startFakeSmtp(options: { port?: number; host?: string; captureDir: string }): Promise<FakeSmtp> {
  const host = options.host ?? "127.0.0.1";
  fs.mkdirSync(options.captureDir, { recursive: true });
  let counter = 0;
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS"],
    logger: false,
    size: 1024 * 1024,
    onData(stream, _session, callback) {
      simpleParser(stream)
        .then((parsed) => {
          const to = Array.isArray(parsed.to) ? parsed.to.flatMap((a) => a.value) : (parsed.to?.value ?? []);
          const html = typeof parsed.html === "string" ? parsed.html : "";
          const text = parsed.text ?? "";
          const mail: CapturedMail = {
            id: `${Date.now()}-${process.pid}-${++counter}`,
            receivedAt: new Date().toISOString(),
            from: parsed.from?.text ?? "",
            to: to.map((a) => a.address ?? "").filter(Boolean),
            subject: parsed.subject ?? "",
            text,
            html,
            links: extractLinks(text + "\n" + html),
            // Header lines as sent (e.g. List-Unsubscribe), keyed in lower case.
            headers: Object.fromEntries(
              parsed.headerLines.map((h) => [h.key, h.line.slice(h.line.indexOf(":") + 1).trim()]),
            ),
          };
          const file = path.join(options.captureDir, `${mail.id}.json`);
          // Write then rename, so a reader never sees half a message.
          fs.writeFileSync(`${file}.tmp`, JSON.stringify(mail, null, 2));
          fs.renameSync(`${file}.tmp`, file);
          callback();
        })
        .catch((error: Error) => callback(error));
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(options.port ?? 0, host, () => resolve());
  });
  const address = server.server.address();
  const port = typeof address === "object" && address ? address.port : (options.port ?? 0);
  return {
    url: `smtp://${host}:${port}`,
    port,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
