import { Form, Link, useNavigation, useSearchParams } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/links";
import { AdminNav } from "~/components/admin-nav";
import { FormMessage } from "~/components/ui/field";
import { dayWriter } from "~/features/accounts/time-zone.server";
import { requireRole } from "~/permissions.server";
import { findLinkByToken, listPublicLinks, restoreLink, takeDownLink } from "~/features/sharing/share.server";
import { fieldErrors, formValues } from "~/utils/form-errors";
import { invalid, readForm } from "~/http/pages.server";

export const meta: Route.MetaFunction = () => [{ title: "Public links · Admin · Fernwater" }];

/** The token in a pasted share address ("https://…/s/<token>" or the bare token). */
function tokenFrom(pasted: string): string {
  const trimmed = pasted.trim();
  const m = /\/s\/([^/?#\s]+)/.exec(trimmed);
  return m ? m[1] : trimmed;
}

export async function loader({ request }: Route.LoaderArgs) {
  const dayOf = dayWriter(request, await requireRole(request, "admin"));
  const pasted = new URL(request.url).searchParams.get("link")?.slice(0, 500) ?? "";
  const found = pasted ? findLinkByToken(tokenFrom(pasted)) : null;
  return {
    links: listPublicLinks().map((l) => ({
      id: l.id,
      createdAt: dayOf(l.createdAt),
      takenDownAt: l.takenDownAt ? dayOf(l.takenDownAt) : null,
      takedownReason: l.takedownReason,
      scenarioName: l.scenarioName,
      tankName: l.tankName,
      ownerName: l.ownerName,
      ownerEmail: l.ownerEmail,
    })),
    search: pasted ? { pasted, foundId: found && !found.link.revokedAt ? found.link.id : null } : null,
  };
}

const TakeDownSchema = z.object({
  intent: z.literal("take-down"),
  linkId: z.coerce.number().int().positive(),
  reason: z
    .string({ error: "Say why the link breaks the rules; the owner reads it." })
    .trim()
    .min(3, "Say why the link breaks the rules; the owner reads it.")
    .max(500, "Keep the reason under 500 characters."),
});
const RestoreSchema = z.object({ intent: z.literal("restore"), linkId: z.coerce.number().int().positive() });

export async function action({ request }: Route.ActionArgs) {
  const admin = await requireRole(request, "admin");
  const values = formValues(await readForm(request));
  if (values.intent === "take-down") {
    const parsed = TakeDownSchema.safeParse(values);
    if (!parsed.success) return invalid(fieldErrors(parsed.error), values);
    if (!takeDownLink(parsed.data.linkId, admin.id, parsed.data.reason)) {
      return invalid({ "": "That link is no longer live (turned off, taken down or deleted)." }, values);
    }
    return { done: "The link is down. Its address answers “not found”; the owner sees your reason." };
  }
  if (values.intent === "restore") {
    const parsed = RestoreSchema.safeParse(values);
    if (!parsed.success) return invalid(fieldErrors(parsed.error), values);
    if (!restoreLink(parsed.data.linkId)) return invalid({ "": "That link is not taken down." }, values);
    return { done: "The link is live again at its old address." };
  }
  return invalid({ "": "Unknown action." }, values);
}

export default function AdminLinksPage({ loaderData, actionData }: Route.ComponentProps) {
  const { links, search } = loaderData;
  const [params] = useSearchParams();
  const busy = useNavigation().state === "submitting";
  const failure = actionData && "errors" in actionData ? actionData : null;
  const done = actionData && "done" in actionData ? actionData.done : null;
  const failedFor = failure ? Number(failure.values.linkId) : null;
  return (
    <div className="space-y-5">
      <AdminNav />
      <h1 className="text-2xl">Public links</h1>
      <p className="text-sm text-stone-700">
        Every shared scenario whose link is on or taken down. Taking a link down makes its address answer “not found”
        and shows your reason to the owner, who cannot share that scenario again until you restore it.
      </p>
      <Form method="get" className="flex flex-wrap items-end gap-2">
        <div className="min-w-0 flex-1 space-y-1">
          <label htmlFor="find-link" className="block text-sm font-semibold">
            Find a reported link
          </label>
          <input
            id="find-link"
            name="link"
            defaultValue={params.get("link") ?? ""}
            placeholder="Paste the address, …/s/…"
            className="input"
          />
        </div>
        <button type="submit" className="btn-secondary">
          Find
        </button>
      </Form>
      {search ? (
        search.foundId ? (
          <FormMessage tone="info">That address is link #{search.foundId}, marked below.</FormMessage>
        ) : (
          <FormMessage tone="info">No live or taken-down link has that address.</FormMessage>
        )
      ) : null}
      {done ? <FormMessage tone="success">{done}</FormMessage> : null}
      {failure?.errors[""] ? <FormMessage>{failure.errors[""]}</FormMessage> : null}
      {links.length === 0 ? <p>No public links.</p> : null}
      <ul className="space-y-3">
        {links.map((l) => (
          <li
            key={l.id}
            id={`link-${l.id}`}
            className={`card space-y-2 ${search?.foundId === l.id ? "ring-2 ring-amber-400" : ""}`}
            aria-label={`Link #${l.id}: ${l.scenarioName}`}
          >
            <div className="flex flex-wrap items-baseline justify-between gap-2">
              <p>
                <span className="font-semibold">{l.scenarioName}</span>{" "}
                <span className="text-sm text-stone-600">in {l.tankName}</span>
              </p>
              <p className="text-sm">
                {l.takenDownAt ? (
                  <span className="font-semibold text-red-800">taken down {l.takenDownAt}</span>
                ) : (
                  <span className="font-semibold text-fern-800">live</span>
                )}
              </p>
            </div>
            <p className="text-sm text-stone-700">
              #{l.id} · by {l.ownerName} ({l.ownerEmail}) · made {l.createdAt} ·{" "}
              <Link to={`/admin/links/${l.id}`} className="link">
                Review
              </Link>
            </p>
            {l.takenDownAt ? (
              <div className="flex flex-wrap items-center gap-3 text-sm">
                <p>Reason: {l.takedownReason}</p>
                <Form method="post">
                  <input type="hidden" name="intent" value="restore" />
                  <input type="hidden" name="linkId" value={l.id} />
                  <button type="submit" className="btn-secondary py-1" disabled={busy}>
                    Restore
                  </button>
                </Form>
              </div>
            ) : (
              <Form method="post" className="flex flex-wrap items-start gap-2" noValidate>
                <input type="hidden" name="intent" value="take-down" />
                <input type="hidden" name="linkId" value={l.id} />
                <div className="min-w-0 flex-1 space-y-1">
                  <label htmlFor={`reason-${l.id}`} className="sr-only">
                    Reason for taking down link #{l.id}
                  </label>
                  <input
                    id={`reason-${l.id}`}
                    name="reason"
                    maxLength={500}
                    placeholder="Reason (the owner sees it)"
                    defaultValue={failedFor === l.id ? failure?.values.reason : undefined}
                    className="input py-1 text-sm"
                    aria-invalid={failedFor === l.id && failure?.errors.reason ? true : undefined}
                    aria-describedby={failedFor === l.id && failure?.errors.reason ? `reason-${l.id}-error` : undefined}
                  />
                  {failedFor === l.id && failure?.errors.reason ? (
                    <p id={`reason-${l.id}-error`} className="text-sm font-semibold text-red-800" role="alert">
                      {failure.errors.reason}
                    </p>
                  ) : null}
                </div>
                <button type="submit" className="btn-danger py-1" disabled={busy}>
                  Take down
                </button>
              </Form>
            )}
          </li>
        ))}
      </ul>
    </div>
  );
}
