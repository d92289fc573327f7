ALTER TYPE "public"."job_state" ADD VALUE 'bench_revision' BEFORE 'final_checks';--> statement-breakpoint
ALTER TABLE "job" ADD COLUMN "settled_total_minor" integer;--> statement-breakpoint
ALTER TABLE "payment" ADD COLUMN "arrived_stale" boolean DEFAULT false NOT NULL;