// The header and footer around every page.
import { Form, Link, NavLink, useLocation, useRouteLoaderData } from "react-router";
import { BrandMark } from "./brand-mark";
import { hasPendingSaves, sendPendingSaves } from "~/lib/pending-saves";
import { forgetInTab } from "~/lib/tab-storage";

/** What the root loader tells the header about the signed-in person. */
export interface HeaderAccount {
  displayName: string;
  homes: { path: string; label: string }[];
}

/** The signed-in person's homes, name and a sign-out button; a plain form post, so it works without JavaScript. */
function AccountNav({ account }: { account: HeaderAccount }) {
  return (
    <>
      {account.homes.map((home) => (
        <NavLink key={home.path} to={home.path} className={({ isActive }) => (isActive ? "tap font-bold no-underline" : "tap")}>
          {home.label}
        </NavLink>
      ))}
      <span className="text-ink-soft">
        Signed in as <strong className="text-ink">{account.displayName}</strong>
      </span>
      <Form method="post" action="/sign-out" onSubmit={beforeSigningOut}>
        <input type="hidden" name="intent" value="here" />
        <button type="submit" className="btn btn-quiet">
          Sign out
        </button>
      </Form>
    </>
  );
}

/**
 * Before the session ends: a draft still owed to the server is sent first (it could not be saved
 * after), and what this tab kept of forms (a child's name while a seat is bought, the analyser's
 * readings) is forgotten, so the next person at a shared computer does not find it.
 */
function beforeSigningOut(event: React.FormEvent<HTMLFormElement>) {
  const form = event.currentTarget;
  if (!hasPendingSaves()) return forgetInTab();
  event.preventDefault();
  void sendPendingSaves().then(() => {
    forgetInTab();
    form.submit(); // the plain form post, as without JavaScript
  });
}

export function SiteHeader({ children }: { children?: React.ReactNode }) {
  const account = (useRouteLoaderData("root") as { account?: HeaderAccount | null } | undefined)?.account ?? null;
  return (
    <header className="border-b border-rule bg-paper">
      <div className="mx-auto flex max-w-6xl flex-wrap items-center justify-between gap-3 px-5 py-3">
        <Link to="/" className="flex items-center gap-2 no-underline text-ink">
          <BrandMark size={36} title="" />
          <span className="font-reading text-[length:var(--text-step-1)] font-semibold tracking-tight">Bendwise</span>
        </Link>
        <nav aria-label="Main" className="flex flex-wrap items-center gap-4 text-[length:var(--text-step--1)]">
          {children ??
            (account ? (
              <AccountNav account={account} />
            ) : (
              <>
                <Link to="/tools/analyse" className="tap">Analyse readings</Link>
                <Link to="/#pricing" className="tap">Pricing</Link>
                <Link to="/sign-in" className="btn">
                  Sign in
                </Link>
              </>
            ))}
        </nav>
      </div>
    </header>
  );
}

/** Notices an action sends the visitor on with (`?notice=…`), said once at the top of the page they land on. */
const NOTICES: Record<string, string> = {
  "password-changed": "Your new password is saved and you are signed in. Anywhere else you were signed in has been signed out.",
};

export function LandingNotice() {
  const notice = NOTICES[new URLSearchParams(useLocation().search).get("notice") ?? ""];
  if (!notice) return null;
  return (
    <div className="mx-auto max-w-6xl px-5 pt-4">
      <p role="status" className="rounded bg-spruce-wash p-3 font-bold text-ok" data-testid="landing-notice">
        {notice}
      </p>
    </div>
  );
}

export function SiteFooter() {
  const account = (useRouteLoaderData("root") as { account?: HeaderAccount | null } | undefined)?.account ?? null;
  return (
    <footer className="border-t border-rule mt-16">
      <div className="mx-auto max-w-6xl px-5 py-8 text-[length:var(--text-step--1)] text-ink-soft flex flex-wrap gap-x-8 gap-y-2">
        <span>Bendwise — hands-on labs on how materials stretch, bend and break.</span>
        <span>No ads, no trackers. Children sign in without an e-mail address.</span>
        {account ? <Link to="/sign-out">Signed in on a lost or shared device? Sign out everywhere</Link> : null}
      </div>
    </footer>
  );
}
