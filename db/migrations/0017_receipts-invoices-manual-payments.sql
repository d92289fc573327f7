CREATE TYPE "public"."money_document_kind" AS ENUM('receipt', 'refund', 'invoice');--> statement-breakpoint
CREATE TYPE "public"."payment_method" AS ENUM('card', 'cash', 'cheque');--> statement-breakpoint
ALTER TYPE "public"."payment_status" ADD VALUE 'voided';--> statement-breakpoint
CREATE TABLE "document_counter" (
	"kind" "money_document_kind" NOT NULL,
	"year" integer NOT NULL,
	"last_number" integer DEFAULT 0 NOT NULL,
	CONSTRAINT "document_counter_kind_year_pk" PRIMARY KEY("kind","year")
);
--> statement-breakpoint
CREATE TABLE "money_document" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"kind" "money_document_kind" NOT NULL,
	"year" integer NOT NULL,
	"sequence" integer NOT NULL,
	"number" text NOT NULL,
	"job_id" uuid NOT NULL,
	"payment_id" uuid,
	"refund_id" uuid,
	"revision_id" uuid,
	"issued_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "money_document_number_unique" UNIQUE("number")
);
--> statement-breakpoint
DROP INDEX "payment_one_paid_per_revision_idx";--> statement-breakpoint
ALTER TABLE "shop_settings" ADD COLUMN "tax_number" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "payment" ADD COLUMN "method" "payment_method" DEFAULT 'card' NOT NULL;--> statement-breakpoint
ALTER TABLE "payment" ADD COLUMN "cheque_number" text;--> statement-breakpoint
ALTER TABLE "payment" ADD COLUMN "received_on" date;--> statement-breakpoint
ALTER TABLE "payment" ADD COLUMN "voided_by" text;--> statement-breakpoint
ALTER TABLE "payment" ADD COLUMN "voided_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "payment" ADD COLUMN "void_reason" text;--> statement-breakpoint
ALTER TABLE "money_document" ADD CONSTRAINT "money_document_job_id_job_id_fk" FOREIGN KEY ("job_id") REFERENCES "public"."job"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "money_document" ADD CONSTRAINT "money_document_payment_id_payment_id_fk" FOREIGN KEY ("payment_id") REFERENCES "public"."payment"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "money_document" ADD CONSTRAINT "money_document_refund_id_refund_id_fk" FOREIGN KEY ("refund_id") REFERENCES "public"."refund"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "money_document" ADD CONSTRAINT "money_document_revision_id_estimate_revision_id_fk" FOREIGN KEY ("revision_id") REFERENCES "public"."estimate_revision"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "money_document_series_idx" ON "money_document" USING btree ("kind","year","sequence");--> statement-breakpoint
CREATE UNIQUE INDEX "money_document_payment_idx" ON "money_document" USING btree ("payment_id") WHERE "money_document"."kind" = 'receipt';--> statement-breakpoint
CREATE UNIQUE INDEX "money_document_refund_idx" ON "money_document" USING btree ("refund_id") WHERE "money_document"."kind" = 'refund';--> statement-breakpoint
CREATE UNIQUE INDEX "money_document_invoice_idx" ON "money_document" USING btree ("job_id") WHERE "money_document"."kind" = 'invoice';--> statement-breakpoint
CREATE INDEX "money_document_job_idx" ON "money_document" USING btree ("job_id");--> statement-breakpoint
ALTER TABLE "payment" ADD CONSTRAINT "payment_voided_by_user_id_fk" FOREIGN KEY ("voided_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "payment_one_paid_card_per_revision_idx" ON "payment" USING btree ("revision_id","purpose") WHERE "payment"."status" = 'paid' and "payment"."method" = 'card';