// Every URL of the app, in one list. The access-matrix test fails when a route here has no entry there.
import { type RouteConfig, index, route } from "@react-router/dev/routes";

export default [
  index("routes/home.tsx"),
  route("healthz", "routes/healthz.ts"),
  // Sign-in, homes and Auth.js's own endpoints
  route("auth/*", "routes/auth.$.ts"),
  route("sign-in", "routes/sign-in.tsx"),
  route("sign-in/link", "routes/sign-in.link.tsx"),
  route("sign-out", "routes/sign-out.tsx"),
  route("reset-password", "routes/reset-password.tsx"),
  route("reset-password/:token", "routes/reset-password.$token.tsx"),
  route("learn", "routes/learn.tsx"),
  route("teach", "routes/teach.tsx"),
  route("teach/classes/:classId", "routes/teach.classes.$classId.tsx"),
  route("school", "routes/school.tsx"),
  route("family", "routes/family.tsx"),
  // Teaching: classes, rosters, assignments, the gradebook (issue 6)
  route("teach/classes", "routes/teach.classes.tsx"),
  route("teach/classes/:classId/roster", "routes/teach.classes.$classId.roster.tsx"),
  route("teach/classes/:classId/settings", "routes/teach.classes.$classId.settings.tsx"),
  route("teach/classes/:classId/assignments", "routes/teach.classes.$classId.assignments.tsx"),
  route("teach/classes/:classId/gradebook", "routes/teach.classes.$classId.gradebook.tsx"),
  route("teach/classes/:classId/gradebook/csv", "routes/teach.classes.$classId.gradebook.csv.ts"),
  route("teach/classes/:classId/students/:studentId", "routes/teach.classes.$classId.students.$studentId.tsx"),
  route("teach/classes/:classId/lessons/:slug", "routes/teach.classes.$classId.lessons.$slug.tsx"),
  route("teach/classes/:classId/lessons/:slug/exercises/:exerciseId", "routes/teach.classes.$classId.lessons.$slug.exercises.$exerciseId.tsx"),
  route("teach/classes/:classId/lessons/:slug/exercises/:exerciseId/csv", "routes/teach.classes.$classId.lessons.$slug.exercises.$exerciseId.csv.ts"),
  route("api/teach/classes/:classId/gradebook", "routes/api.teach.classes.$classId.gradebook.ts"),
  route("school/classes", "routes/school.classes.tsx"),
  // The course
  route("learn/:slug", "routes/learn.lesson.tsx"),
  route("lesson-code/:file", "routes/lesson-code.ts"),
  route("photos/:id", "routes/photos.ts"),
  // Open to everyone
  route("api/analysis", "routes/api.analysis.ts"),
  route("tools/analyse", "routes/tools.analyse.tsx"),
  // Seats and payments
  route("school/seats", "routes/school.seats.tsx"),
  route("school/seats/buy", "routes/school.seats.buy.tsx"),
  route("family/seats", "routes/family.seats.tsx"),
  route("receipts/:purchaseId", "routes/receipts.$purchaseId.tsx"),
  route("payments/confirming", "routes/payments.confirming.tsx"),
  route("payments/stopped", "routes/payments.stopped.tsx"),
  route("api/payments/status", "routes/api.payments.status.ts"),
  route("api/payments/webhook", "routes/api.payments.webhook.ts"),
] satisfies RouteConfig;
