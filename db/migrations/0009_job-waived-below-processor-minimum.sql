ALTER TABLE "job" ADD COLUMN "waived_minor" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "job" ADD COLUMN "waived_by" text;--> statement-breakpoint
ALTER TABLE "job" ADD COLUMN "waived_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "job" ADD CONSTRAINT "job_waived_by_user_id_fk" FOREIGN KEY ("waived_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;