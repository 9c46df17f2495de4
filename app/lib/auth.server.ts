// Bendwise's sign-in and permissions, for every loader and action. Import from here:
//
//   const user = await requireUser(request);                          // or redirect to /sign-in and back
//   const { user, membership } = await requireRole(request, ["teacher"]); // or 403
//   requireMembership(user, klass.organisationId, ["teacher"]);       // or 403, for a record's organisation
//   assertSameOrigin(request);                                         // first line of every action (CSRF)
//
// The pieces live in app/lib/auth/; see DEVELOPERS.md ("Sign-in, roles and form posts").
export {
  getUser,
  requireUser,
  requireRole,
  requireMembership,
  homePathFor,
  homesFor,
  forbiddenResponse,
  HOMES,
  ROLE_NAMES,
  ROLE_ORDER,
  type Membership,
  type Role,
  type SessionUser,
} from "./auth/session.server";
export { assertSameOrigin, isSameOrigin } from "./auth/same-origin.server";
export { safeRedirectTo } from "./auth/redirect-to";
export { resetChildPassword, mayManageChild, type ResetChildPasswordResult } from "./auth/children.server";
export { checkNewPassword, newPasswordSchema } from "./auth/password-rules.server";
