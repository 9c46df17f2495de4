CREATE TABLE "payment_customers" (
	"organisation_id" uuid PRIMARY KEY NOT NULL,
	"provider_customer_id" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "payment_customers_provider_customer_id_unique" UNIQUE("provider_customer_id")
);
--> statement-breakpoint
CREATE TABLE "payment_events" (
	"id" text PRIMARY KEY NOT NULL,
	"type" text NOT NULL,
	"object_id" text,
	"received_at" timestamp with time zone DEFAULT now() NOT NULL,
	"processed_at" timestamp with time zone,
	"outcome" text,
	"deliveries" integer DEFAULT 1 NOT NULL,
	"last_error" text
);
--> statement-breakpoint
CREATE TABLE "seat_assignments" (
	"organisation_id" uuid NOT NULL,
	"school_year" text NOT NULL,
	"student_id" uuid NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "seat_assignments_organisation_id_school_year_student_id_pk" PRIMARY KEY("organisation_id","school_year","student_id")
);
--> statement-breakpoint
ALTER TABLE "seat_purchases" ADD COLUMN "buyer_user_id" uuid;--> statement-breakpoint
ALTER TABLE "seat_purchases" ADD COLUMN "invoice_number" text;--> statement-breakpoint
ALTER TABLE "seat_purchases" ADD COLUMN "invoice_url" text;--> statement-breakpoint
ALTER TABLE "seat_purchases" ADD COLUMN "receipt_sent_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "payment_customers" ADD CONSTRAINT "payment_customers_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "seat_assignments" ADD CONSTRAINT "seat_assignments_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "seat_assignments" ADD CONSTRAINT "seat_assignments_student_id_users_id_fk" FOREIGN KEY ("student_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "seat_assignments_student" ON "seat_assignments" USING btree ("student_id");--> statement-breakpoint
ALTER TABLE "seat_purchases" ADD CONSTRAINT "seat_purchases_buyer_user_id_users_id_fk" FOREIGN KEY ("buyer_user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;