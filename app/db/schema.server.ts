// The database schema. One file so a newcomer sees every table at once;
// drizzle-kit reads it to generate the SQL migrations in drizzle/.
import {
  bigint,
  boolean,
  doublePrecision,
  index,
  jsonb,
  integer,
  pgEnum,
  pgTable,
  primaryKey,
  text,
  timestamp,
  unique,
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
    /** Children only, optional: the number the school's own records use, so exports line up. */
    studentNumber: text("student_number"),
    passwordHash: text("password_hash"),
    /** Raised by "sign out everywhere" and by password changes; old sessions stop working. */
    sessionVersion: integer("session_version").notNull().default(1),
    /**
     * Students: raised (from the sequence gradebook_versions) by database triggers whenever their
     * work or their name changes, so a kept gradebook knows it is out of date (loadGradebook in teaching/gradebook.server.ts).
     */
    workVersion: bigint("work_version", { mode: "number" }).notNull().default(0),
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
    /** An IANA time zone; due dates are entered and shown in it, so server and browser agree. */
    timeZone: text("time_zone").notNull().default("UTC"),
    archivedAt: timestamp("archived_at", { withTimezone: true }),
    /** Raised by database triggers when the roster, assignments or accommodations change (see users.workVersion). */
    gradebookVersion: bigint("gradebook_version", { mode: "number" }).notNull().default(0),
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
    /** Who asked for it; the receipt goes to them (or to the organisation's administrators). */
    buyerUserId: uuid("buyer_user_id").references(() => users.id, { onDelete: "set null" }),
    /** Invoices only: the provider's invoice number and the page where it can be read and paid. */
    invoiceNumber: text("invoice_number"),
    invoiceUrl: text("invoice_url"),
    /** Set when the e-mailed receipt has gone out, so it goes out once. */
    receiptSentAt: timestamp("receipt_sent_at", { withTimezone: true }),
  },
  (t) => [index("seat_purchases_org_year").on(t.organisationId, t.schoolYear)],
);

/**
 * One student holding one seat of an organisation for one school year. Enrolling in a class (or a
 * parent creating a child account) takes a seat; leaving the last class of that year frees it.
 */
export const seatAssignments = pgTable(
  "seat_assignments",
  {
    organisationId: uuid("organisation_id")
      .notNull()
      .references(() => organisations.id, { onDelete: "cascade" }),
    schoolYear: text("school_year").notNull(),
    studentId: uuid("student_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    createdAt: createdAt(),
  },
  (t) => [
    primaryKey({ columns: [t.organisationId, t.schoolYear, t.studentId] }),
    index("seat_assignments_student").on(t.studentId),
  ],
);

/** Every signed event from the payment provider, kept once by its id so a repeat changes nothing. */
export const paymentEvents = pgTable("payment_events", {
  /** The provider's event id (evt_…). */
  id: text("id").primaryKey(),
  type: text("type").notNull(),
  /** The checkout session or invoice the event is about. */
  objectId: text("object_id"),
  receivedAt: timestamp("received_at", { withTimezone: true }).notNull().defaultNow(),
  /** Set once the event has been acted on; a delivery of a processed event is answered and ignored. */
  processedAt: timestamp("processed_at", { withTimezone: true }),
  /** What acting on it did, e.g. "seats-added", "already-fulfilled", "ignored". */
  outcome: text("outcome"),
  deliveries: integer("deliveries").notNull().default(1),
  lastError: text("last_error"),
});

/** The payment provider's customer record for an organisation, made on its first invoice. */
export const paymentCustomers = pgTable("payment_customers", {
  organisationId: uuid("organisation_id")
    .primaryKey()
    .references(() => organisations.id, { onDelete: "cascade" }),
  providerCustomerId: text("provider_customer_id").notNull().unique(),
  createdAt: createdAt(),
});

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


// ───────────────────────── The course: what each student did in each lesson ─────────────────────────

/** Every answer a student sends to an exercise, right or wrong; nothing is overwritten. */
export const exerciseAttempts = pgTable(
  "exercise_attempts",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    studentId: uuid("student_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    lessonSlug: text("lesson_slug").notNull(),
    exerciseId: text("exercise_id").notNull(),
    /** which set of numbers the student had (the seed is student, exercise, variant) */
    variant: integer("variant").notNull().default(0),
    /** exactly what was typed (for tables and choices: JSON of the cells or the choice and reason) */
    rawAnswer: text("raw_answer").notNull(),
    parsedValue: doublePrecision("parsed_value"),
    parsedUnit: text("parsed_unit"),
    /** the answer checker's outcome: correct, unit-missing, unit-wrong-kind, sig-figs-off, incorrect, unreadable */
    outcome: text("outcome").notNull(),
    correct: integer("correct").notNull().default(0),
    slipCode: text("slip_code"),
    createdAt: createdAt(),
  },
  (t) => [index("exercise_attempts_student_lesson").on(t.studentId, t.lessonSlug, t.exerciseId)],
);

/** A prediction committed before the data is shown; kept as it was. */
export const predictions = pgTable(
  "predictions",
  {
    studentId: uuid("student_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    lessonSlug: text("lesson_slug").notNull(),
    predictionId: text("prediction_id").notNull(),
    choice: text("choice").notNull(),
    createdAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.studentId, t.lessonSlug, t.predictionId] })],
);

/** A student's own readings table in a lesson, with its settings. */
export const readingSets = pgTable(
  "reading_sets",
  {
    studentId: uuid("student_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    lessonSlug: text("lesson_slug").notNull(),
    readingsId: text("readings_id").notNull(),
    mode: text("mode", { enum: ["bend", "stretch"] }).notNull(),
    material: text("material").notNull().default(""),
    unloadedCm: doublePrecision("unloaded_cm"),
    resolutionCm: doublePrecision("resolution_cm").notNull(),
    /** [{ forceN, readingCm, returnReadingCm?, broke? }] as validated by the analysis schema */
    points: jsonb("points").notNull(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.studentId, t.lessonSlug, t.readingsId] })],
);

/** A written claim–evidence–reasoning answer; a teacher's review sits beside it. */
export const writtenAnswers = pgTable(
  "written_answers",
  {
    studentId: uuid("student_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    lessonSlug: text("lesson_slug").notNull(),
    answerId: text("answer_id").notNull(),
    claim: text("claim").notNull().default(""),
    evidence: text("evidence").notNull().default(""),
    reasoning: text("reasoning").notNull().default(""),
    handedInAt: timestamp("handed_in_at", { withTimezone: true }),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
    /** the teacher's review: 0–2 points each for claim, evidence and reasoning, and a comment */
    reviewScores: jsonb("review_scores"),
    reviewComment: text("review_comment"),
    reviewedBy: uuid("reviewed_by").references(() => users.id, { onDelete: "set null" }),
    reviewedAt: timestamp("reviewed_at", { withTimezone: true }),
  },
  (t) => [primaryKey({ columns: [t.studentId, t.lessonSlug, t.answerId] })],
);

/** A photo of a set-up; the file itself lives in the photo store (a local folder by default). */
export const photos = pgTable(
  "photos",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    studentId: uuid("student_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    lessonSlug: text("lesson_slug").notNull(),
    photoId: text("photo_id").notNull(),
    storageKey: text("storage_key").notNull().unique(),
    contentType: text("content_type").notNull(),
    bytes: integer("bytes").notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("photos_student_lesson").on(t.studentId, t.lessonSlug)],
);

/** Where a student last was in each lesson, so "continue" takes them back there. */
export const lessonVisits = pgTable(
  "lesson_visits",
  {
    studentId: uuid("student_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    lessonSlug: text("lesson_slug").notNull(),
    /** the page anchor of the last part worked on, e.g. "exercise-stiffness-one-reading" */
    lastPlace: text("last_place"),
    completedAt: timestamp("completed_at", { withTimezone: true }),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.studentId, t.lessonSlug] })],
);


// ───────────────────────── Teaching: lessons assigned to a class, and accommodations ─────────────────────────

/** What happens to work done after the due date. */
export const latePolicy = pgEnum("late_policy", ["accept", "penalty", "closed"]);
export type LatePolicy = (typeof latePolicy.enumValues)[number];

/** A lesson assigned to a class, with when it opens, when it is due and how late work counts. */
export const assignments = pgTable(
  "assignments",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    classId: uuid("class_id")
      .notNull()
      .references(() => classes.id, { onDelete: "cascade" }),
    lessonSlug: text("lesson_slug").notNull(),
    opensAt: timestamp("opens_at", { withTimezone: true }).notNull(),
    dueAt: timestamp("due_at", { withTimezone: true }).notNull(),
    latePolicy: latePolicy("late_policy").notNull().default("accept"),
    /** "penalty" only: percentage points taken off an exercise's credit per day (or part of a day) late */
    latePenaltyPercent: integer("late_penalty_percent").notNull().default(0),
    createdAt: createdAt(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("assignments_class_lesson").on(t.classId, t.lessonSlug)],
);

/**
 * A quiet adjustment for one student in one class: more attempts at each exercise and more days
 * before the due date. With no assignment it holds for every lesson assigned to the class; a row
 * for one assignment replaces it for that lesson. Only the teacher and the student's own pages use it.
 */
export const accommodations = pgTable(
  "accommodations",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    classId: uuid("class_id")
      .notNull()
      .references(() => classes.id, { onDelete: "cascade" }),
    studentId: uuid("student_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    assignmentId: uuid("assignment_id").references(() => assignments.id, { onDelete: "cascade" }),
    extraAttempts: integer("extra_attempts").notNull().default(0),
    extraDays: integer("extra_days").notNull().default(0),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    unique("accommodations_scope").on(t.classId, t.studentId, t.assignmentId).nullsNotDistinct(),
    index("accommodations_student").on(t.studentId),
  ],
);


// ───────────────────────── Families and e-mail ─────────────────────────

/**
 * A parent who has asked for a family account and not yet opened the link in the e-mail. Nothing
 * else exists until they do: the account, the household and its code are made from this row, which
 * is then deleted. Rows that were never confirmed are dropped after their link runs out.
 */
export const familySignUps = pgTable("family_sign_ups", {
  id: uuid("id").primaryKey().defaultRandom(),
  /** Stored lower-case; one waiting sign-up per address (asking again replaces it). */
  email: text("email").notNull().unique(),
  displayName: text("display_name").notNull(),
  householdName: text("household_name").notNull(),
  passwordHash: text("password_hash").notNull(),
  expiresAt: timestamp("expires_at", { withTimezone: true }).notNull(),
  createdAt: createdAt(),
});

/** A school administrator's invitation to a teacher; the e-mailed link (verification_tokens, "teacher-invite") runs out at expiresAt. */
export const teacherInvitations = pgTable(
  "teacher_invitations",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    organisationId: uuid("organisation_id")
      .notNull()
      .references(() => organisations.id, { onDelete: "cascade" }),
    /** Stored lower-case. */
    email: text("email").notNull(),
    displayName: text("display_name").notNull(),
    invitedBy: uuid("invited_by").references(() => users.id, { onDelete: "set null" }),
    expiresAt: timestamp("expires_at", { withTimezone: true }).notNull(),
    acceptedAt: timestamp("accepted_at", { withTimezone: true }),
    acceptedBy: uuid("accepted_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [index("teacher_invitations_org").on(t.organisationId), index("teacher_invitations_email").on(t.email)],
);

/** What e-mail an adult wants beyond the ones they ask for. No row = the defaults (weekly summary on). */
export const mailPreferences = pgTable("mail_preferences", {
  userId: uuid("user_id")
    .primaryKey()
    .references(() => users.id, { onDelete: "cascade" }),
  weeklySummary: boolean("weekly_summary").notNull().default(true),
  /** The ISO week ("2026-W49") whose summary was last queued, so a second run that week sends none. */
  lastSummaryWeek: text("last_summary_week"),
  updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
});
