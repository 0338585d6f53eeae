import {
  Form,
  isRouteErrorResponse,
  Link,
  Links,
  Meta,
  NavLink,
  Outlet,
  Scripts,
  ScrollRestoration,
  useMatches,
  useRouteLoaderData,
} from "react-router";
import type { Route } from "./+types/root";
import "~/app.css";
import { FooterCaution } from "~/components/cautions";
import { getEnv } from "~/env.server";
import { getSessionUser } from "~/session.server";
import { useNonce } from "~/utils/nonce";
import { ZONE_COOKIE } from "~/utils/time-zones";

const ZONE_SCRIPT = `try{document.cookie="${ZONE_COOKIE}="+encodeURIComponent(Intl.DateTimeFormat().resolvedOptions().timeZone)+";path=/;max-age=31536000;samesite=lax"}catch(e){}`;

export const links: Route.LinksFunction = () => [{ rel: "icon", href: "/favicon.ico" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await getSessionUser(request);
  return { user, devMail: getEnv().mode === "local" };
}

export function Layout({ children }: { children: React.ReactNode }) {
  const nonce = useNonce();
  return (
    <html lang="en">
      <head>
        <meta charSet="utf-8" />
        <meta name="viewport" content="width=device-width, initial-scale=1" />
        <Meta />
        <Links />
        {/* The browser's time zone, for calendar days until the person chooses one (app/utils/time-zones.ts). */}
        <script nonce={nonce} dangerouslySetInnerHTML={{ __html: ZONE_SCRIPT }} />
      </head>
      <body className="min-h-screen bg-[#fbfaf7] text-stone-900 antialiased">
        {children}
        <ScrollRestoration nonce={nonce} />
        <Scripts nonce={nonce} />
      </body>
    </html>
  );
}

function navClass({ isActive }: { isActive: boolean }) {
  return `rounded px-2 py-1 ${isActive ? "bg-fern-100 text-fern-900" : "text-stone-700 hover:text-fern-800"}`;
}

function Shell({ children }: { children: React.ReactNode }) {
  // A page whose route asks for the whole width (the classroom presentation, shown on a
  // projector) is not held to the reading width of the rest.
  const wide = (useMatches().at(-1)?.handle as { wide?: boolean } | undefined)?.wide === true;
  const data = useRouteLoaderData<typeof loader>("root");
  const user = data?.user ?? null;
  return (
    <div className="flex min-h-screen flex-col">
      <a
        href="#main"
        className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:bg-white focus:p-2"
      >
        Skip to content
      </a>
      <header className="border-b border-stone-200 bg-white">
        <div className="mx-auto flex max-w-6xl flex-wrap items-center justify-between gap-2 px-4 py-3">
          <Link to="/" className="text-xl font-bold text-fern-800">
            Fernwater
          </Link>
          <nav aria-label="Main" className="flex flex-wrap items-center gap-1 text-sm">
            {user ? (
              <>
                <NavLink to="/tanks" className={navClass}>
                  Tanks
                </NavLink>
                {/* Everyone: educators run classes there, students join and open their lessons. */}
                <NavLink to="/classes" className={navClass}>
                  Classes
                </NavLink>
                {user.role === "admin" ? (
                  <NavLink to="/admin" className={navClass}>
                    Admin
                  </NavLink>
                ) : null}
                <NavLink to="/account" className={navClass}>
                  {user.name}
                </NavLink>
                <Form method="post" action="/sign-out">
                  <button type="submit" className="rounded px-2 py-1 text-stone-700 hover:text-fern-800">
                    Sign out
                  </button>
                </Form>
              </>
            ) : (
              <>
                <NavLink to="/sign-in" className={navClass}>
                  Sign in
                </NavLink>
                <NavLink to="/sign-up" className={navClass}>
                  Create account
                </NavLink>
              </>
            )}
            {data?.devMail ? (
              <NavLink to="/dev/mail" className={navClass}>
                Mail (local)
              </NavLink>
            ) : null}
          </nav>
        </div>
      </header>
      <main id="main" className={`mx-auto w-full flex-1 px-4 py-6 ${wide ? "max-w-none sm:px-8" : "max-w-6xl"}`}>
        {children}
      </main>
      <footer className="border-t border-stone-200 bg-white">
        <div className="mx-auto max-w-6xl space-y-1 px-4 py-4 text-xs text-stone-600">
          <FooterCaution />
          <p>Fernwater {__APP_VERSION__}</p>
        </div>
      </footer>
    </div>
  );
}

export default function App() {
  return (
    <Shell>
      <Outlet />
    </Shell>
  );
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  let title = "Something went wrong";
  let detail = "An unexpected error stopped this page. Your data is safe; try again, or go back to your tanks.";
  let status: number | undefined;
  if (isRouteErrorResponse(error)) {
    status = error.status;
    const message =
      typeof error.data === "object" && error.data && "message" in error.data ? String(error.data.message) : undefined;
    if (error.status === 404) {
      title = "Page not found";
      detail =
        message && message !== "Not found"
          ? message
          : "There is nothing at this address. It may have been moved, turned off or never existed.";
    } else if (error.status === 403) {
      title = "Not allowed";
      detail = message ?? "Your account cannot open this page.";
    } else {
      title = `${error.status} ${error.statusText || "Error"}`;
      detail = message ?? detail;
    }
  } else if (import.meta.env.DEV && error instanceof Error) {
    detail = error.message;
  }
  return (
    <Shell>
      <title>{`${title} · Fernwater`}</title>
      <section className="card mx-auto max-w-xl space-y-3" aria-labelledby="error-title">
        {status ? <p className="figure text-sm text-stone-500">Error {status}</p> : null}
        <h1 id="error-title" className="text-2xl">
          {title}
        </h1>
        <p>{detail}</p>
        <p className="flex gap-4">
          <Link to="/" className="link">
            Home
          </Link>
          <Link to="/tanks" className="link">
            Your tanks
          </Link>
        </p>
      </section>
    </Shell>
  );
}
