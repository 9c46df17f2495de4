// The database schema. One file so a newcomer sees every table at once;
// drizzle-kit reads it to generate the SQL migrations in drizzle/.
import {
  index,
  integer,
  pgEnum,
  pgTable,
  primaryKey,
  text,
  timestamp,
  uniqueIndex,
  uuid,
} from "drizzle-orm/pg-core";

const createdAt = () => timestamp("created_at", { withTimezone: true }).notNull().defaultNow();

/** A school, or a household that teaches its own children. */
export const organisationKind = pgEnum("organisation_kind", ["school", "household"]);

/** What a person may do inside one organisation; a person can hold several. */
export const role = pgEnum("role", ["school_admin", "teacher", "student", "parent"]);
export type Role = (typeof role.enumValues)[number];

/** A grade band is all a child's account says about their age. */
export const gradeBand = pgEnum("grade_band", ["6-8", "9-10"]);

export const organisations = pgTable("organisations", {
  id: uuid("id").primaryKey().defaultRandom(),
  kind: organisationKind("kind").notNull(),
  name: text("name").notNull(),
  /** Stable key used by the seed and in URLs. */
  slug: text("slug").notNull().unique(),
  /** A household's children sign in with this code (schools use class codes). */
  signInCode: text("sign_in_code").unique(),
  createdAt: createdAt(),
});

export const users = pgTable(
  "users",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    /** Adults only; stored lower-case. Children have no e-mail address. */
    email: text("email").unique(),
    emailVerifiedAt: timestamp("email_verified_at", { withTimezone: true }),
    /** Children only: the organisation whose code they sign in with. */
    homeOrganisationId: uuid("home_organisation_id").references(() => organisations.id, {
      onDelete: "cascade",
    }),
    /** Children only: unique inside their home organisation. */
    username: text("username"),
    displayName: text("display_name").notNull(),
    gradeBand: gradeBand("grade_band"),
    passwordHash: text("password_hash"),
    /** Raised by "sign out everywhere" and by password changes; old sessions stop working. */
    sessionVersion: integer("session_version").notNull().default(1),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex("users_home_org_username").on(t.homeOrganisationId, t.username),
  ],
);

export const memberships = pgTable(
  "memberships",
  {
    userId: uuid("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    organisationId: uuid("organisation_id")
      .notNull()
      .references(() => organisations.id, { onDelete: "cascade" }),
    role: role("role").notNull(),
    createdAt: createdAt(),
  },
  (t) => [
    primaryKey({ columns: [t.userId, t.organisationId, t.role] }),
    index("memberships_org_role").on(t.organisationId, t.role),
  ],
);

export const classes = pgTable(
  "classes",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    organisationId: uuid("organisation_id")
      .notNull()
      .references(() => organisations.id, { onDelete: "cascade" }),
    teacherId: uuid("teacher_id")
      .notNull()
      .references(() => users.id, { onDelete: "restrict" }),
    name: text("name").notNull(),
    /** A school year such as "2026-27". */
    schoolYear: text("school_year").notNull(),
    /** Students of the class sign in with this code. */
    signInCode: text("sign_in_code").notNull().unique(),
    archivedAt: timestamp("archived_at", { withTimezone: true }),
    createdAt: createdAt(),
  },
  (t) => [
    index("classes_org").on(t.organisationId),
    uniqueIndex("classes_org_year_name").on(t.organisationId, t.schoolYear, t.name),
  ],
);

export const enrollments = pgTable(
  "enrollments",
  {
    classId: uuid("class_id")
      .notNull()
      .references(() => classes.id, { onDelete: "cascade" }),
    studentId: uuid("student_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    createdAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.classId, t.studentId] }), index("enrollments_student").on(t.studentId)],
);

/** Seats bought for one school year; the ledger is the sum of paid rows. */
export const seatPurchases = pgTable(
  "seat_purchases",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    organisationId: uuid("organisation_id")
      .notNull()
      .references(() => organisations.id, { onDelete: "cascade" }),
    schoolYear: text("school_year").notNull(),
    seats: integer("seats").notNull(),
    amountCents: integer("amount_cents").notNull(),
    currency: text("currency").notNull().default("usd"),
    method: text("method", { enum: ["card", "invoice", "demo"] }).notNull(),
    status: text("status", { enum: ["pending", "paid", "void"] }).notNull(),
    /** The payment provider's id of the checkout session or invoice; unique so fulfilment runs once. */
    providerRef: text("provider_ref").unique(),
    purchaseOrder: text("purchase_order"),
    paidAt: timestamp("paid_at", { withTimezone: true }),
    createdAt: createdAt(),
  },
  (t) => [index("seat_purchases_org_year").on(t.organisationId, t.schoolYear)],
);

/** Failed sign-ins, kept in PostgreSQL so throttling holds across app processes. */
export const signInFailures = pgTable(
  "sign_in_failures",
  {
    /** "account:<key>" or "address:<ip>". */
    bucket: text("bucket").primaryKey(),
    failures: integer("failures").notNull().default(0),
    lastFailureAt: timestamp("last_failure_at", { withTimezone: true }).notNull().defaultNow(),
    blockedUntil: timestamp("blocked_until", { withTimezone: true }),
  },
);

/** Fixed-window request counters for public endpoints, per address. */
export const rateLimits = pgTable(
  "rate_limits",
  {
    bucket: text("bucket").notNull(),
    windowStart: timestamp("window_start", { withTimezone: true }).notNull(),
    hits: integer("hits").notNull().default(0),
  },
  (t) => [primaryKey({ columns: [t.bucket, t.windowStart] })],
);

/** One-time tokens for e-mailed sign-in links and password resets (stored hashed). */
export const verificationTokens = pgTable(
  "verification_tokens",
  {
    identifier: text("identifier").notNull(),
    token: text("token").notNull(),
    expires: timestamp("expires", { withTimezone: true }).notNull(),
    purpose: text("purpose").notNull().default("sign-in"),
  },
  (t) => [primaryKey({ columns: [t.identifier, t.token] })],
);

