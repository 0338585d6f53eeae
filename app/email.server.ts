/**
 * Outgoing e-mail. Always SMTP through nodemailer; SMTP_URL points at the real service in
 * production and at the local fake (app/mail/fake-smtp.server.ts) everywhere else.
 */
import nodemailer, { type Transporter } from "nodemailer";
import { getEnv } from "~/env.server";

let transport: Transporter | undefined;

function getTransport(): Transporter {
  const url = getEnv().SMTP_URL;
  if (!url) throw new Error("SMTP_URL is not set: no mail service to send through.");
  transport ??= nodemailer.createTransport(url);
  return transport;
}

export type OutgoingMail = {
  to: string;
  subject: string;
  text: string;
  html?: string;
  /** Extra header lines (List-Unsubscribe for reminders). */
  headers?: Record<string, string>;
};

export async function sendMail(mail: OutgoingMail): Promise<void> {
  await getTransport().sendMail({ from: getEnv().MAIL_FROM, ...mail });
}

/** Absolute URL for links in e-mails: APP_URL when set, else the request's own origin. */
export function absoluteUrl(request: Request, pathname: string): string {
  const base = getEnv().APP_URL ?? new URL(request.url).origin;
  return new URL(pathname, base).toString();
}
