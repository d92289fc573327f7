CREATE TABLE "instrument_choice" (
	"user_id" text NOT NULL,
	"kind" text NOT NULL,
	"instrument_id" uuid NOT NULL,
	"chosen_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "instrument_choice_user_id_kind_pk" PRIMARY KEY("user_id","kind")
);
--> statement-breakpoint
CREATE TABLE "instrument" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"kind" text NOT NULL,
	"maker" text NOT NULL,
	"model" text NOT NULL,
	"serial" text NOT NULL,
	"calibrated_on" date NOT NULL,
	"calibration_due_on" date NOT NULL,
	"retired_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"created_by" text,
	CONSTRAINT "instrument_kind_check" CHECK ("instrument"."kind" in ('signal_generator', 'frequency_counter', 'meter', 'oscilloscope', 'sweep_generator', 'leakage_tester', 'tube_tester')),
	CONSTRAINT "instrument_due_after_calibration_check" CHECK ("instrument"."calibration_due_on" >= "instrument"."calibrated_on")
);
--> statement-breakpoint
DROP INDEX "reading_job_key_idx";--> statement-breakpoint
ALTER TABLE "reading" ADD COLUMN "phase" text DEFAULT 'as_returned' NOT NULL;--> statement-breakpoint
ALTER TABLE "reading" ADD COLUMN "instrument_id" uuid;--> statement-breakpoint
ALTER TABLE "reading" ADD COLUMN "instrument_overdue" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "instrument_choice" ADD CONSTRAINT "instrument_choice_user_id_user_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "instrument_choice" ADD CONSTRAINT "instrument_choice_instrument_id_instrument_id_fk" FOREIGN KEY ("instrument_id") REFERENCES "public"."instrument"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "instrument" ADD CONSTRAINT "instrument_created_by_user_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "instrument_identity_idx" ON "instrument" USING btree (lower("maker"),lower("model"),lower("serial"));--> statement-breakpoint
ALTER TABLE "reading" ADD CONSTRAINT "reading_instrument_id_instrument_id_fk" FOREIGN KEY ("instrument_id") REFERENCES "public"."instrument"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "reading_job_key_phase_idx" ON "reading" USING btree ("job_id","key","phase");--> statement-breakpoint
CREATE INDEX "reading_instrument_idx" ON "reading" USING btree ("instrument_id");--> statement-breakpoint
ALTER TABLE "reading" ADD CONSTRAINT "reading_phase_check" CHECK ("reading"."phase" in ('as_received', 'as_returned'));