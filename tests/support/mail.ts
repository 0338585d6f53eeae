import { getEnv, redirectMailTo } from "~/env.server";
import { type CapturedMail, listCapturedMail } from "~/mail/captured-mail.server";
import { startFakeSmtp, type FakeSmtp } from "~/mail/fake-smtp.server";

/** Starts the fake SMTP server for this test file and points the app's mail at it. */
export async function startMailFake(): Promise<FakeSmtp> {
  const fake = await startFakeSmtp({ captureDir: getEnv().MAIL_CAPTURE_DIR });
  redirectMailTo(fake.url);
  return fake;
}

/** Waits (up to 5 s) for a captured message to `to`, newest first. */
export async function waitForMail(to: string, timeoutMs = 5000): Promise<CapturedMail> {
  const start = Date.now();
  for (;;) {
    const found = listCapturedMail(getEnv().MAIL_CAPTURE_DIR).find((m) => m.to.includes(to));
    if (found) return found;
    if (Date.now() - start > timeoutMs) throw new Error(`no mail to ${to} within ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

export function mailTo(to: string): CapturedMail[] {
  return listCapturedMail(getEnv().MAIL_CAPTURE_DIR).filter((m) => m.to.includes(to));
}
