ALTER TYPE "public"."payment_status" ADD VALUE 'duplicate';--> statement-breakpoint
ALTER TYPE "public"."refund_status" ADD VALUE 'pending' BEFORE 'succeeded';--> statement-breakpoint
ALTER TABLE "email_outbox" ADD COLUMN "queued_at" timestamp with time zone;