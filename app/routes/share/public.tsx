import { asc, eq } from "drizzle-orm";
import { data, Form, isRouteErrorResponse, Link, redirect, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/public";
import { PREVIEW_HEIGHT, PREVIEW_WIDTH } from "~/components/charts/preview-card";
import { ReadOnlyResults } from "~/components/read-only-results";
import { FormMessage, SelectField, TextField } from "~/components/ui/field";
import { copyScenarioInto, type CopyDestination } from "~/features/scenarios/copies.server";
import { getDb } from "~/db/client.server";
import { tanks } from "~/db/schema";
import { absoluteUrl } from "~/email.server";
import { notFound, requireUser } from "~/permissions.server";
import { describeView, readOnlyScenarioView } from "~/features/runs/read-only-view.server";
import { getSessionUser } from "~/session.server";
import { etagMatches, findLinkByToken, isLive, sharePath, shareEtag } from "~/features/sharing/share.server";
import { readStoredSettings } from "~/features/runs/simulation.server";
import { requireOwnedTank } from "~/features/tanks/tanks.server";
import { DEFAULT_PREFERENCES, displayUnitsFor } from "~/utils/display-units";
import { formValues } from "~/utils/form-errors";
import { invalid, readForm, refusedForm } from "~/http/pages.server";

const GONE = "This link is not shared, or no longer: its owner may have turned it off or made a new one.";
const SHARED_TANK = { name: "Shared with me", notes: "Copies of scenarios other people shared." };

export const meta: Route.MetaFunction = ({ data }) => {
  if (!data) return [{ title: "Shared scenario not found · Fernwater" }, { name: "robots", content: "noindex" }];
  const title = `${data.name} · shared on Fernwater`;
  return [
    { title },
    { name: "description", content: data.description },
    // Unguessable links are not for search engines; forums still read the preview tags.
    { name: "robots", content: "noindex, nofollow" },
    { property: "og:type", content: "website" },
    { property: "og:site_name", content: "Fernwater" },
    { property: "og:title", content: title },
    { property: "og:description", content: data.description },
    { property: "og:url", content: data.url },
    { name: "twitter:title", content: title },
    { name: "twitter:description", content: data.description },
    // The picture forums and chats show with the link: the chart and key figures, 1200×630.
    ...(data.preview
      ? [
          { property: "og:image", content: data.preview.url },
          { property: "og:image:type", content: "image/png" },
          { property: "og:image:width", content: String(PREVIEW_WIDTH) },
          { property: "og:image:height", content: String(PREVIEW_HEIGHT) },
          { property: "og:image:alt", content: data.preview.alt },
          { name: "twitter:card", content: "summary_large_image" },
          { name: "twitter:image", content: data.preview.url },
          { name: "twitter:image:alt", content: data.preview.alt },
        ]
      : [{ name: "twitter:card", content: "summary" }]),
  ];
};

/**
 * Every view asks again (`Cache-Control: no-cache`), so a link turned off stops at once. Only
 * the page's data (`.data`, JSON) carries an ETag and may answer 304: the HTML carries this
 * response's CSP nonce, and a cached body with an old nonce would have its inline scripts
 * refused, so the page would never hydrate. Signed-in views (their own nav and tank list) are
 * private and not validated.
 */
// Rendered from its loader data alone (no clock, no randomness): a repeat view may reuse the rendering (app/http/render-cache.server.ts).
export const handle = { renderCache: true };

export const middleware: Route.MiddlewareFunction[] = [
  async ({ request, params }, next) => {
    const viewer = await getSessionUser(request);
    const found = viewer || request.method !== "GET" ? null : findLinkByToken(params.token);
    const variant = new URL(request.url).pathname.endsWith(".data") ? "data" : "html";
    const tag =
      variant === "data" && found && isLive(found.link)
        ? shareEtag(found.link, found.scenario, found.tank, variant)
        : null;
    const cacheControl = viewer ? "private, no-cache" : "no-cache";
    if (tag && etagMatches(request.headers.get("If-None-Match"), tag)) {
      return new Response(null, {
        status: 304,
        headers: { ETag: tag, "Cache-Control": cacheControl, "X-Robots-Tag": "noindex" },
      });
    }
    const response = (await next()) as Response;
    response.headers.set("Cache-Control", cacheControl);
    response.headers.set("X-Robots-Tag", "noindex");
    if (tag && response.status === 200) response.headers.set("ETag", tag);
    return response;
  },
];

export async function loader({ request, params }: Route.LoaderArgs) {
  const viewer = await getSessionUser(request);
  const found = findLinkByToken(params.token);
  if (!found) notFound(GONE);
  const { link, scenario, tank } = found;
  if (!isLive(link)) {
    // The owner learns why; for everyone else a taken-down link simply does not exist.
    if (viewer?.id === tank.ownerId && link.takenDownAt && !link.revokedAt) {
      throw data(
        { message: `An admin took this link down. Their reason: ${link.takedownReason ?? "none given"}` },
        { status: 410 },
      );
    }
    notFound(GONE);
  }
  const units = displayUnitsFor(viewer ?? DEFAULT_PREFERENCES);
  const view = await readOnlyScenarioView(scenario, tank, units);
  const myTanks = viewer
    ? getDb()
        .select({ id: tanks.id, name: tanks.name })
        .from(tanks)
        .where(eq(tanks.ownerId, viewer.id))
        .orderBy(asc(tanks.name))
        .all()
    : null;
  return {
    token: params.token,
    name: scenario.name,
    view,
    description: describeView(view),
    url: absoluteUrl(request, sharePath(params.token)),
    preview: view.results
      ? {
          url: absoluteUrl(request, `${sharePath(params.token)}/preview.png`),
          alt: `Chart of nitrate in its target band and of free ammonia and nitrite over ${view.results.lengthDays} days, with the key figures, for the scenario ${scenario.name}.`,
        }
      : null,
    viewer: viewer ? { isOwner: viewer.id === tank.ownerId } : null,
    myTanks,
    ownerLinks: viewer?.id === tank.ownerId ? { tankId: tank.id, scenarioId: scenario.id } : null,
  };
}

const CopySchema = z.object({
  intent: z.literal("copy"),
  tankId: z.union([z.literal("new"), z.coerce.number().int().positive()], { error: "Choose one of your tanks." }),
  // The new tank's name; empty gives the usual "Shared with me".
  newTankName: z.string().trim().max(80, "Keep the name under 80 characters.").optional(),
});

export async function action({ request, params }: Route.ActionArgs) {
  // Anonymous visitors go to sign-in and come back to this page.
  const user = await requireUser(request);
  const found = findLinkByToken(params.token);
  if (!found || !isLive(found.link)) notFound(GONE);
  const values = formValues(await readForm(request));
  const parsed = CopySchema.safeParse(values);
  if (!parsed.success) {
    const tooLong = parsed.error.issues.find((i) => i.path[0] === "newTankName");
    return invalid(tooLong ? { newTankName: tooLong.message } : { tankId: "Choose one of your tanks." }, values);
  }
  const settings = readStoredSettings(found.scenario.settings);
  if (!settings)
    return invalid({ "": "The settings of this scenario can no longer be read, so they cannot be copied." }, values);
  const destination: CopyDestination =
    parsed.data.tankId === "new"
      ? { newTank: { ...SHARED_TANK, name: parsed.data.newTankName || SHARED_TANK.name } }
      : { tank: requireOwnedTank(user.id, String(parsed.data.tankId)) };
  try {
    const copy = await copyScenarioInto(user.id, destination, found.scenario.name, settings, found.scenario.id);
    return redirect(`/tanks/${copy.tankId}/scenarios/${copy.scenarioId}`);
  } catch (error) {
    return refusedForm(error, values);
  }
}

export default function SharedScenarioPage({ loaderData, actionData }: Route.ComponentProps) {
  const { name, view, viewer, myTanks, token, ownerLinks } = loaderData;
  const busy = useNavigation().state === "submitting";
  const errors = actionData?.errors ?? {};
  return (
    <div className="space-y-6">
      <header className="space-y-1">
        <p className="text-sm text-stone-600">A scenario shared on Fernwater · read-only</p>
        <h1 className="text-2xl">{name}</h1>
        {viewer ? null : (
          <p className="text-sm text-stone-700">
            Shown in litres, °C and nitrate as NO3. Signed-in visitors see their own units.
          </p>
        )}
      </header>
      <section aria-labelledby="copy-title" className="card space-y-3">
        <h2 id="copy-title" className="text-lg">
          Copy to my tanks
        </h2>
        {errors[""] ? <FormMessage>{errors[""]}</FormMessage> : null}
        {ownerLinks ? (
          <p className="text-sm">
            This is your scenario.{" "}
            <Link className="link" to={`/tanks/${ownerLinks.tankId}/scenarios/${ownerLinks.scenarioId}/share`}>
              Manage the link
            </Link>
          </p>
        ) : null}
        {!viewer ? (
          <p className="flex flex-wrap items-center gap-3 text-sm">
            <span>Try your own changes on a copy: sign in or create a free account, then come back here.</span>
            <Link className="btn" to={`/sign-in?redirectTo=${encodeURIComponent(`/s/${token}`)}`}>
              Sign in to copy
            </Link>
          </p>
        ) : (
          <Form method="post" className="flex flex-wrap items-end gap-3">
            <input type="hidden" name="intent" value="copy" />
            {myTanks && myTanks.length > 0 ? (
              <SelectField
                label="Into which tank?"
                name="tankId"
                options={[
                  ...myTanks.map((t) => ({ value: String(t.id), label: t.name })),
                  { value: "new", label: "A new tank" },
                ]}
                error={errors.tankId}
              />
            ) : (
              <>
                <input type="hidden" name="tankId" value="new" />
                <p className="text-sm">You have no tanks yet: the copy goes into a new tank.</p>
              </>
            )}
            <TextField
              label="Name of a new tank"
              name="newTankName"
              placeholder={SHARED_TANK.name}
              hint={
                myTanks && myTanks.length > 0 ? "Used when you choose “A new tank”." : `Empty: “${SHARED_TANK.name}”.`
              }
              error={errors.newTankName}
              maxLength={80}
            />
            <button type="submit" className="btn" disabled={busy}>
              {busy ? "Copying…" : "Copy to my tanks"}
            </button>
          </Form>
        )}
      </section>
      <ReadOnlyResults name={name} view={view} downloadName={name} />
    </div>
  );
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  const status = isRouteErrorResponse(error) ? error.status : 500;
  const message =
    isRouteErrorResponse(error) && typeof error.data === "object" && error.data && "message" in error.data
      ? String(error.data.message)
      : null;
  return (
    <section className="card mx-auto max-w-xl space-y-3" aria-labelledby="share-error-title">
      <p className="figure text-sm text-stone-500">Error {status}</p>
      <h1 id="share-error-title" className="text-2xl">
        {status === 410
          ? "This link was taken down"
          : status === 404
            ? "This shared link does not work"
            : "Something went wrong"}
      </h1>
      <p>{message ?? "Try again in a moment."}</p>
      <p>
        <Link to="/" className="link">
          Fernwater home
        </Link>
      </p>
    </section>
  );
}
