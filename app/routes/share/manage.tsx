import { useState } from "react";
import { Form, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/manage";
import { FormMessage } from "~/components/ui/field";
import { absoluteUrl } from "~/email.server";
import { dayWriter } from "~/features/accounts/time-zone.server";
import { requireUser } from "~/permissions.server";
import { makeLink, sharePath, shareState, turnOffLink } from "~/features/sharing/share.server";
import { requireOwnedScenario } from "~/features/tanks/tanks.server";
import { fieldErrors, formValues } from "~/utils/form-errors";
import { invalid, readForm } from "~/http/pages.server";
import { Breadcrumbs } from "~/components/breadcrumbs";

export const meta: Route.MetaFunction = ({ data }) => [
  { title: `Share ${data?.scenario.name ?? "scenario"} · Fernwater` },
];

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const { tank, scenario } = requireOwnedScenario(user.id, params.tankId, params.scenarioId);
  const state = shareState(scenario.id);
  const dayOf = dayWriter(request, user);
  return {
    tank: { id: tank.id, name: tank.name },
    scenario: { id: scenario.id, name: scenario.name },
    live: state.live ? { createdAt: dayOf(state.live.createdAt) } : null,
    takedown: state.takedown ? { at: dayOf(state.takedown.at), reason: state.takedown.reason } : null,
  };
}

const IntentSchema = z.object({ intent: z.enum(["make", "off"], { error: "Unknown action." }) });

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireUser(request);
  const { scenario } = requireOwnedScenario(user.id, params.tankId, params.scenarioId);
  const values = formValues(await readForm(request));
  const parsed = IntentSchema.safeParse(values);
  if (!parsed.success) return invalid(fieldErrors(parsed.error), values);
  if (parsed.data.intent === "off") {
    if (!turnOffLink(scenario.id)) return invalid({ "": "There was no public link to turn off." }, values);
    return { done: "off" as const, url: null };
  }
  const token = makeLink(scenario.id);
  if (!token) return invalid({ "": "An admin took this scenario’s link down, so it cannot be shared again." }, values);
  // The only moment the address exists in the clear: it is not stored, so it cannot be shown again.
  return { done: "made" as const, url: absoluteUrl(request, sharePath(token)) };
}

function CopyableLink({ url }: { url: string }) {
  const [copied, setCopied] = useState(false);
  return (
    <div className="space-y-2">
      <label htmlFor="share-url" className="block text-sm font-semibold">
        Your public link
      </label>
      <div className="flex flex-wrap gap-2">
        <input
          id="share-url"
          readOnly
          value={url}
          className="input figure min-w-0 flex-1 text-sm"
          onFocus={(e) => e.currentTarget.select()}
        />
        <button
          type="button"
          className="btn-secondary"
          onClick={() => {
            void navigator.clipboard?.writeText(url).then(() => setCopied(true));
          }}
        >
          {copied ? "Copied" : "Copy"}
        </button>
        <a href={url} className="btn-secondary" target="_blank" rel="noreferrer">
          Open
        </a>
      </div>
      <p className="text-xs text-stone-600">
        Copy it now: Fernwater keeps only a fingerprint of the link, so it cannot show it again. Lost it? Make a new
        one.
      </p>
    </div>
  );
}

export default function ShareScenarioPage({ loaderData, actionData }: Route.ComponentProps) {
  const { tank, scenario, live, takedown } = loaderData;
  const busy = useNavigation().state === "submitting";
  const failure =
    actionData && "errors" in actionData ? (actionData.errors[""] ?? Object.values(actionData.errors)[0]) : null;
  const made = actionData && "done" in actionData && actionData.done === "made" ? actionData.url : null;
  const off = actionData && "done" in actionData && actionData.done === "off";
  return (
    <div className="max-w-3xl space-y-6">
      <Breadcrumbs
        trail={[
          { to: "/tanks", label: "Tanks" },
          { to: `/tanks/${tank.id}`, label: tank.name },
          { to: `/tanks/${tank.id}/scenarios/${scenario.id}`, label: scenario.name },
        ]}
        current="Share"
      />
      <h1 className="text-2xl">Share {scenario.name}</h1>
      <p className="text-sm text-stone-700">
        A public link opens a read-only page with this scenario’s chart, key figures, nitrogen budget and settings, for
        anyone who has the link, with or without an account. It does not show your name, your tanks, other scenarios or
        your test readings. Signed-in visitors can copy the scenario into their own tanks; your scenario stays as it is.
      </p>
      {failure ? <FormMessage>{failure}</FormMessage> : null}
      {off ? <FormMessage tone="success">The link is off: its address now answers “not found”.</FormMessage> : null}
      {takedown ? (
        <FormMessage>
          An admin took the public link of this scenario down on {takedown.at}. Their reason: {takedown.reason}. While
          the takedown stands the scenario cannot be shared again; ask an admin if you think it was a mistake.
        </FormMessage>
      ) : null}
      <section className="card space-y-4" aria-labelledby="link-title">
        <h2 id="link-title" className="text-lg">
          Public link
        </h2>
        {made ? <CopyableLink url={made} /> : null}
        {live ? (
          <p>
            A public link is <strong>on</strong> (made {live.createdAt}).
          </p>
        ) : takedown ? null : (
          <p>
            There is <strong>no</strong> public link.
          </p>
        )}
        {takedown ? null : (
          <div className="flex flex-wrap gap-3">
            <Form method="post">
              <input type="hidden" name="intent" value="make" />
              <button type="submit" className="btn" disabled={busy}>
                {live ? "Make a new link" : "Turn on a public link"}
              </button>
            </Form>
            {live ? (
              <Form method="post">
                <input type="hidden" name="intent" value="off" />
                <button type="submit" className="btn-secondary" disabled={busy}>
                  Turn the link off
                </button>
              </Form>
            ) : null}
          </div>
        )}
        {live ? (
          <p className="text-xs text-stone-600">
            A new link replaces the old one: the old address stops working at once.
          </p>
        ) : null}
      </section>
    </div>
  );
}
