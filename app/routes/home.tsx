import { Link } from "react-router";
import type { Route } from "./+types/home";
import { getSessionUser } from "~/session.server";
import { DEMO_SHARE_TOKEN } from "~/db/seed.server";
import { findLinkByToken, isLive, sharePath } from "~/features/sharing/share.server";

export const meta: Route.MetaFunction = () => [
  { title: "Fernwater · where the nitrogen in your aquarium goes" },
  {
    name: "description",
    content:
      "Fernwater simulates the nitrogen cycle of a freshwater planted aquarium: ammonia, nitrite, nitrate, plants and water changes, day by day.",
  },
];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await getSessionUser(request);
  // The demo club's shared scenario, where the demo data is loaded and the link is still on.
  const demo = findLinkByToken(DEMO_SHARE_TOKEN);
  return { signedIn: Boolean(user), example: demo && isLive(demo.link) ? sharePath(DEMO_SHARE_TOKEN) : null };
}

export default function HomePage({ loaderData }: Route.ComponentProps) {
  return (
    <div className="space-y-8">
      <section className="space-y-4 py-6">
        <h1 className="text-3xl font-bold text-fern-900 sm:text-4xl">Where does the nitrogen in your tank go?</h1>
        <p className="max-w-2xl text-lg text-stone-700">
          Describe your aquarium — water, fish and feeding, plants, filter, water changes and your tap water — and
          Fernwater runs a model of its nitrogen cycle over days to months. See total ammonia, free ammonia, nitrite and
          nitrate over time, account for every milligram of nitrogen, and try what would change if you fed less, cleaned
          the filter more often, changed more water or added fast-growing plants.
        </p>
        <p className="flex flex-wrap gap-3">
          {loaderData.signedIn ? (
            <Link to="/tanks" className="btn">
              Go to your tanks
            </Link>
          ) : (
            <>
              <Link to="/sign-up" className="btn">
                Create an account
              </Link>
              <Link to="/sign-in" className="btn-secondary">
                Sign in
              </Link>
            </>
          )}
          {loaderData.example ? (
            <Link to={loaderData.example} className="btn-secondary">
              See a live example, no account needed
            </Link>
          ) : null}
        </p>
      </section>
      <section className="grid gap-4 sm:grid-cols-3" aria-label="Who Fernwater is for">
        <div className="card">
          <h2 className="text-lg">Keepers</h2>
          <p className="text-sm text-stone-700">
            Keep nitrate in your target band, check the model against your own test-kit readings, and tune it.
          </p>
        </div>
        <div className="card">
          <h2 className="text-lg">Teachers</h2>
          <p className="text-sm text-stone-700">
            Show a new tank cycling, the effect of pH and temperature on free ammonia, and plants competing with
            bacteria. Hand a class a prepared scenario.
          </p>
        </div>
        <div className="card">
          <h2 className="text-lg">Forum members</h2>
          <p className="text-sm text-stone-700">
            Post a read-only link to a scenario so others can see it and copy it.
          </p>
        </div>
      </section>
    </div>
  );
}
