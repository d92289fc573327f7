CREATE TYPE "public"."decision_medium" AS ENUM('in-person', 'phone', 'letter');--> statement-breakpoint
CREATE TYPE "public"."intake_channel" AS ENUM('online', 'counter', 'phone');--> statement-breakpoint
ALTER TABLE "user" ADD COLUMN "contact_only" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "job" ADD COLUMN "channel" "intake_channel" DEFAULT 'online' NOT NULL;--> statement-breakpoint
ALTER TABLE "estimate_revision" ADD COLUMN "decision_recorded_by" text;--> statement-breakpoint
ALTER TABLE "estimate_revision" ADD COLUMN "decision_medium" "decision_medium";--> statement-breakpoint
ALTER TABLE "estimate_revision" ADD COLUMN "decision_note" text;--> statement-breakpoint
ALTER TABLE "estimate_revision" ADD CONSTRAINT "estimate_revision_decision_recorded_by_user_id_fk" FOREIGN KEY ("decision_recorded_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;