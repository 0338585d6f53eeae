import type { Route } from "./+types/mail";
import { getEnv } from "~/env.server";
import { requireLocalTool } from "~/routes/dev/local-tools.server";
import { listCapturedMail } from "~/mail/captured-mail.server";

export const meta: Route.MetaFunction = () => [{ title: "Captured mail (local) · Fernwater" }];

/**
 * Local mode, this machine only (the mail holds password-reset links): the messages the fake
 * SMTP server caught, newest first, with their links.
 */
export function loader({ request, context }: Route.LoaderArgs) {
  requireLocalTool(request, context);
  return { messages: listCapturedMail(getEnv().MAIL_CAPTURE_DIR).slice(0, 50) };
}

export default function DevMailPage({ loaderData }: Route.ComponentProps) {
  return (
    <div className="space-y-4">
      <h1 className="text-2xl">Captured mail</h1>
      <p className="text-sm text-stone-700">
        This server runs in local mode: e-mail goes to a fake mail server on this machine, not to anyone’s inbox. The
        newest 50 messages are listed here.
      </p>
      {loaderData.messages.length === 0 ? <p>No mail yet.</p> : null}
      <ul className="space-y-4">
        {loaderData.messages.map((m) => (
          <li key={m.id} className="card space-y-2">
            <p className="text-sm text-stone-600">
              <span className="figure">{m.receivedAt}</span> · to {m.to.join(", ")}
            </p>
            <h2 className="text-lg">{m.subject}</h2>
            <pre className="whitespace-pre-wrap font-serif text-sm">{m.text}</pre>
            {m.links.length ? (
              <ul className="text-sm">
                {m.links.map((l) => (
                  <li key={l}>
                    <a href={l} className="link break-all">
                      {l}
                    </a>
                  </li>
                ))}
              </ul>
            ) : null}
          </li>
        ))}
      </ul>
    </div>
  );
}
