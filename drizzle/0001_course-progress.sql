CREATE TABLE "exercise_attempts" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"student_id" uuid NOT NULL,
	"lesson_slug" text NOT NULL,
	"exercise_id" text NOT NULL,
	"variant" integer DEFAULT 0 NOT NULL,
	"raw_answer" text NOT NULL,
	"parsed_value" double precision,
	"parsed_unit" text,
	"outcome" text NOT NULL,
	"correct" integer DEFAULT 0 NOT NULL,
	"slip_code" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "lesson_visits" (
	"student_id" uuid NOT NULL,
	"lesson_slug" text NOT NULL,
	"last_place" text,
	"completed_at" timestamp with time zone,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "lesson_visits_student_id_lesson_slug_pk" PRIMARY KEY("student_id","lesson_slug")
);
--> statement-breakpoint
CREATE TABLE "photos" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"student_id" uuid NOT NULL,
	"lesson_slug" text NOT NULL,
	"photo_id" text NOT NULL,
	"storage_key" text NOT NULL,
	"content_type" text NOT NULL,
	"bytes" integer NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "photos_storage_key_unique" UNIQUE("storage_key")
);
--> statement-breakpoint
CREATE TABLE "predictions" (
	"student_id" uuid NOT NULL,
	"lesson_slug" text NOT NULL,
	"prediction_id" text NOT NULL,
	"choice" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "predictions_student_id_lesson_slug_prediction_id_pk" PRIMARY KEY("student_id","lesson_slug","prediction_id")
);
--> statement-breakpoint
CREATE TABLE "reading_sets" (
	"student_id" uuid NOT NULL,
	"lesson_slug" text NOT NULL,
	"readings_id" text NOT NULL,
	"mode" text NOT NULL,
	"material" text DEFAULT '' NOT NULL,
	"unloaded_cm" double precision,
	"resolution_cm" double precision NOT NULL,
	"points" jsonb NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "reading_sets_student_id_lesson_slug_readings_id_pk" PRIMARY KEY("student_id","lesson_slug","readings_id")
);
--> statement-breakpoint
CREATE TABLE "written_answers" (
	"student_id" uuid NOT NULL,
	"lesson_slug" text NOT NULL,
	"answer_id" text NOT NULL,
	"claim" text DEFAULT '' NOT NULL,
	"evidence" text DEFAULT '' NOT NULL,
	"reasoning" text DEFAULT '' NOT NULL,
	"handed_in_at" timestamp with time zone,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"review_scores" jsonb,
	"review_comment" text,
	"reviewed_by" uuid,
	"reviewed_at" timestamp with time zone,
	CONSTRAINT "written_answers_student_id_lesson_slug_answer_id_pk" PRIMARY KEY("student_id","lesson_slug","answer_id")
);
--> statement-breakpoint
ALTER TABLE "exercise_attempts" ADD CONSTRAINT "exercise_attempts_student_id_users_id_fk" FOREIGN KEY ("student_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lesson_visits" ADD CONSTRAINT "lesson_visits_student_id_users_id_fk" FOREIGN KEY ("student_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "photos" ADD CONSTRAINT "photos_student_id_users_id_fk" FOREIGN KEY ("student_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "predictions" ADD CONSTRAINT "predictions_student_id_users_id_fk" FOREIGN KEY ("student_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reading_sets" ADD CONSTRAINT "reading_sets_student_id_users_id_fk" FOREIGN KEY ("student_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "written_answers" ADD CONSTRAINT "written_answers_student_id_users_id_fk" FOREIGN KEY ("student_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "written_answers" ADD CONSTRAINT "written_answers_reviewed_by_users_id_fk" FOREIGN KEY ("reviewed_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "exercise_attempts_student_lesson" ON "exercise_attempts" USING btree ("student_id","lesson_slug","exercise_id");--> statement-breakpoint
CREATE INDEX "photos_student_lesson" ON "photos" USING btree ("student_id","lesson_slug");