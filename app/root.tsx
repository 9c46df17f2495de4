import "@fontsource/literata/400.css";
import "@fontsource/literata/600.css";
import "@fontsource/literata/400-italic.css";
import "@fontsource/atkinson-hyperlegible/400.css";
import "@fontsource/atkinson-hyperlegible/700.css";
import "./app.css";

import { isRouteErrorResponse, Links, Meta, Outlet, Scripts, ScrollRestoration } from "react-router";
import type { Route } from "./+types/root";
import { LandingNotice, SiteFooter, SiteHeader, type HeaderAccount } from "~/components/site-chrome";
import { getUser, homesFor } from "~/lib/auth.server";
import { useNonce } from "~/lib/nonce";

export const links: Route.LinksFunction = () => [{ rel: "icon", href: "/favicon.svg", type: "image/svg+xml" }];

/** Who is signed in, for the header: a display name and their homes. Nothing more goes to every page. */
export async function loader({ request }: Route.LoaderArgs) {
  const user = await getUser(request);
  const account: HeaderAccount | null = user ? { displayName: user.displayName, homes: homesFor(user) } : null;
  return { account };
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
      </head>
      <body className="min-h-screen flex flex-col">
        <a href="#main" className="skip-link">
          Skip to the page
        </a>
        {children}
        <ScrollRestoration nonce={nonce} />
        <Scripts nonce={nonce} />
      </body>
    </html>
  );
}

export default function App() {
  return (
    <>
      <SiteHeader />
      <main id="main" className="flex-1">
        <LandingNotice />
        <Outlet />
      </main>
      <SiteFooter />
    </>
  );
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  let heading = "Something went wrong";
  let detail = "The page could not be shown. Please try again in a moment.";
  if (isRouteErrorResponse(error)) {
    if (error.status === 404) {
      heading = "Page not found";
      detail = "There is nothing at this address. Check the link, or start again from the home page.";
    } else if (error.status === 403) {
      heading = "Not yours to open";
      detail =
        typeof error.data === "string" && error.data
          ? error.data
          : "Your account does not have access to this page. If you think it should, ask your school's Bendwise administrator.";
    } else if (error.status === 503) {
      heading = "Not available just now";
      detail = typeof error.data === "string" && error.data ? error.data : "Please try again in a few seconds.";
    } else {
      heading = `${error.status} ${error.statusText || "Error"}`;
      if (typeof error.data === "string" && error.data) detail = error.data;
    }
  } else if (import.meta.env.DEV && error instanceof Error) {
    detail = error.message;
  }
  // While the database is away, who is signed in cannot be known: no "Sign in" to someone who is.
  const unavailable = isRouteErrorResponse(error) && error.status === 503;
  return (
    <>
      {unavailable ? (
        <SiteHeader>
          <span />
        </SiteHeader>
      ) : (
        <SiteHeader />
      )}
      <main id="main" className="flex-1 mx-auto w-full max-w-3xl px-5 py-16">
        <h1 className="text-[length:var(--text-step-3)] mb-4">{heading}</h1>
        <p className="text-ink-soft mb-6">{detail}</p>
        <a className="btn" href="/">
          Back to the home page
        </a>
      </main>
      <SiteFooter />
    </>
  );
}
