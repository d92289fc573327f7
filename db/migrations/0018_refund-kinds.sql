CREATE TYPE "public"."refund_kind" AS ENUM('return', 'reduction');--> statement-breakpoint
ALTER TABLE "refund" ADD COLUMN "kind" "refund_kind" DEFAULT 'return' NOT NULL;