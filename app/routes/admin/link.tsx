import { eq } from "drizzle-orm";
import { Link } from "react-router";
import type { Route } from "./+types/link";
import { AdminNav } from "~/components/admin-nav";
import { ReadOnlyResults } from "~/components/read-only-results";
import { getDb } from "~/db/client.server";
import { users } from "~/db/schema";
import { notFound, requireRole } from "~/permissions.server";
import { readOnlyScenarioView } from "~/features/runs/read-only-view.server";
import { findLinkById } from "~/features/sharing/share.server";
import { parseId } from "~/features/tanks/tanks.server";
import { displayUnitsFor } from "~/utils/display-units";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Review ${data?.name ?? "link"} · Admin · Fernwater` }];

/** What a public link shows, for an admin deciding on a report (the token itself is never stored). */
export async function loader({ request, params }: Route.LoaderArgs) {
  const admin = await requireRole(request, "admin");
  const found = findLinkById(parseId(params.linkId));
  if (!found || found.link.revokedAt) notFound("There is no such public link (it may have been turned off).");
  const owner = getDb()
    .select({ name: users.name, email: users.email })
    .from(users)
    .where(eq(users.id, found.tank.ownerId))
    .get();
  return {
    id: found.link.id,
    name: found.scenario.name,
    tankName: found.tank.name,
    owner: owner ?? { name: "", email: "" },
    takenDown: found.link.takenDownAt ? { reason: found.link.takedownReason ?? "" } : null,
    view: await readOnlyScenarioView(found.scenario, found.tank, displayUnitsFor(admin)),
  };
}

export default function AdminLinkReviewPage({ loaderData }: Route.ComponentProps) {
  const { id, name, tankName, owner, takenDown, view } = loaderData;
  return (
    <div className="space-y-5">
      <AdminNav />
      <p className="text-sm">
        <Link to={`/admin/links#link-${id}`} className="link">
          Back to public links
        </Link>
      </p>
      <h1 className="text-2xl">
        Link #{id}: {name}
      </h1>
      <p className="text-sm text-stone-700">
        In {owner.name}’s tank “{tankName}” ({owner.email}).{" "}
        {takenDown ? `Taken down: ${takenDown.reason}` : "Live: this is what visitors see."}
      </p>
      <ReadOnlyResults name={name} view={view} downloadName={name} />
    </div>
  );
}
