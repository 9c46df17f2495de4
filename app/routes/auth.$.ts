// Auth.js's own endpoints under /auth/* (csrf, session, providers, callback/<provider>, signout).
// Bendwise's pages do not send people here: they sign in from their own actions (see
// app/lib/auth/auth-config.server.ts). Reach these with plain requests, never fetchers.
import type { Route } from "./+types/auth.$";
import { handleAuthRoute } from "~/lib/auth/auth-config.server";

export function loader({ request }: Route.LoaderArgs) {
  return handleAuthRoute(request);
}

export function action({ request }: Route.ActionArgs) {
  return handleAuthRoute(request);
}
