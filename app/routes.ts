// Every URL of the app, in one list. The access-matrix test fails when a route here has no entry there.
import { type RouteConfig, index, route } from "@react-router/dev/routes";

export default [
  index("routes/home.tsx"),
  route("healthz", "routes/healthz.ts"),
  // The course
  route("learn/:slug", "routes/learn.lesson.tsx"),
  route("lesson-code/:file", "routes/lesson-code.ts"),
  route("photos/:id", "routes/photos.ts"),
] satisfies RouteConfig;
