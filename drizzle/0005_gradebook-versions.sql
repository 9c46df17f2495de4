ALTER TABLE "classes" ADD COLUMN "gradebook_version" bigint DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "users" ADD COLUMN "work_version" bigint DEFAULT 0 NOT NULL;--> statement-breakpoint
-- A gradebook is kept computed between reads (app/lib/teaching/gradebook-cache.server.ts) and is
-- out of date as soon as anything it is made of changes. These triggers raise a number whenever that
-- happens, from one sequence, so "the largest number among the class and its students" grows with
-- every change: a student's attempts, written answers, lesson visits or name (users.work_version),
-- and the class's roster, assignments and accommodations (classes.gradebook_version). In the database
-- so that every writer (the app, scripts, a restore) keeps them right.
CREATE SEQUENCE "gradebook_versions";--> statement-breakpoint
CREATE FUNCTION "gradebook_student_work_changed"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  UPDATE "users" SET "work_version" = nextval('gradebook_versions')
  WHERE "id" IN (SELECT DISTINCT "student_id" FROM "changed_rows");
  RETURN NULL;
END
$$;--> statement-breakpoint
CREATE FUNCTION "gradebook_class_changed"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  UPDATE "classes" SET "gradebook_version" = nextval('gradebook_versions')
  WHERE "id" IN (SELECT DISTINCT "class_id" FROM "changed_rows");
  RETURN NULL;
END
$$;--> statement-breakpoint
CREATE FUNCTION "gradebook_student_renamed"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  NEW."work_version" := nextval('gradebook_versions');
  RETURN NEW;
END
$$;--> statement-breakpoint
CREATE TRIGGER "exercise_attempts_added" AFTER INSERT ON "exercise_attempts" REFERENCING NEW TABLE AS "changed_rows" FOR EACH STATEMENT EXECUTE FUNCTION "gradebook_student_work_changed"();--> statement-breakpoint
CREATE TRIGGER "exercise_attempts_changed" AFTER UPDATE ON "exercise_attempts" REFERENCING NEW TABLE AS "changed_rows" FOR EACH STATEMENT EXECUTE FUNCTION "gradebook_student_work_changed"();--> statement-breakpoint
CREATE TRIGGER "exercise_attempts_removed" AFTER DELETE ON "exercise_attempts" REFERENCING OLD TABLE AS "changed_rows" FOR EACH STATEMENT EXECUTE FUNCTION "gradebook_student_work_changed"();--> statement-breakpoint
CREATE TRIGGER "written_answers_added" AFTER INSERT ON "written_answers" REFERENCING NEW TABLE AS "changed_rows" FOR EACH STATEMENT EXECUTE FUNCTION "gradebook_student_work_changed"();--> statement-breakpoint
CREATE TRIGGER "written_answers_changed" AFTER UPDATE ON "written_answers" REFERENCING NEW TABLE AS "changed_rows" FOR EACH STATEMENT EXECUTE FUNCTION "gradebook_student_work_changed"();--> statement-breakpoint
CREATE TRIGGER "written_answers_removed" AFTER DELETE ON "written_answers" REFERENCING OLD TABLE AS "changed_rows" FOR EACH STATEMENT EXECUTE FUNCTION "gradebook_student_work_changed"();--> statement-breakpoint
CREATE TRIGGER "lesson_visits_added" AFTER INSERT ON "lesson_visits" REFERENCING NEW TABLE AS "changed_rows" FOR EACH STATEMENT EXECUTE FUNCTION "gradebook_student_work_changed"();--> statement-breakpoint
CREATE TRIGGER "lesson_visits_changed" AFTER UPDATE ON "lesson_visits" REFERENCING NEW TABLE AS "changed_rows" FOR EACH STATEMENT EXECUTE FUNCTION "gradebook_student_work_changed"();--> statement-breakpoint
CREATE TRIGGER "lesson_visits_removed" AFTER DELETE ON "lesson_visits" REFERENCING OLD TABLE AS "changed_rows" FOR EACH STATEMENT EXECUTE FUNCTION "gradebook_student_work_changed"();--> statement-breakpoint
CREATE TRIGGER "enrollments_added" AFTER INSERT ON "enrollments" REFERENCING NEW TABLE AS "changed_rows" FOR EACH STATEMENT EXECUTE FUNCTION "gradebook_class_changed"();--> statement-breakpoint
CREATE TRIGGER "enrollments_changed" AFTER UPDATE ON "enrollments" REFERENCING NEW TABLE AS "changed_rows" FOR EACH STATEMENT EXECUTE FUNCTION "gradebook_class_changed"();--> statement-breakpoint
CREATE TRIGGER "enrollments_removed" AFTER DELETE ON "enrollments" REFERENCING OLD TABLE AS "changed_rows" FOR EACH STATEMENT EXECUTE FUNCTION "gradebook_class_changed"();--> statement-breakpoint
CREATE TRIGGER "assignments_added" AFTER INSERT ON "assignments" REFERENCING NEW TABLE AS "changed_rows" FOR EACH STATEMENT EXECUTE FUNCTION "gradebook_class_changed"();--> statement-breakpoint
CREATE TRIGGER "assignments_changed" AFTER UPDATE ON "assignments" REFERENCING NEW TABLE AS "changed_rows" FOR EACH STATEMENT EXECUTE FUNCTION "gradebook_class_changed"();--> statement-breakpoint
CREATE TRIGGER "assignments_removed" AFTER DELETE ON "assignments" REFERENCING OLD TABLE AS "changed_rows" FOR EACH STATEMENT EXECUTE FUNCTION "gradebook_class_changed"();--> statement-breakpoint
CREATE TRIGGER "accommodations_added" AFTER INSERT ON "accommodations" REFERENCING NEW TABLE AS "changed_rows" FOR EACH STATEMENT EXECUTE FUNCTION "gradebook_class_changed"();--> statement-breakpoint
CREATE TRIGGER "accommodations_changed" AFTER UPDATE ON "accommodations" REFERENCING NEW TABLE AS "changed_rows" FOR EACH STATEMENT EXECUTE FUNCTION "gradebook_class_changed"();--> statement-breakpoint
CREATE TRIGGER "accommodations_removed" AFTER DELETE ON "accommodations" REFERENCING OLD TABLE AS "changed_rows" FOR EACH STATEMENT EXECUTE FUNCTION "gradebook_class_changed"();--> statement-breakpoint
CREATE TRIGGER "users_renamed" BEFORE UPDATE OF "display_name", "username", "student_number" ON "users" FOR EACH ROW EXECUTE FUNCTION "gradebook_student_renamed"();
