CREATE TABLE "owner_address" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"owner_id" text NOT NULL,
	"recipient" text NOT NULL,
	"line1" text NOT NULL,
	"line2" text,
	"city" text NOT NULL,
	"region" text,
	"postal_code" text,
	"country" text NOT NULL,
	"is_default" boolean DEFAULT false NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "user" ADD COLUMN "contact_preference" text DEFAULT 'email' NOT NULL;--> statement-breakpoint
ALTER TABLE "user" ADD COLUMN "closed_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "job" ADD COLUMN "return_address" jsonb;--> statement-breakpoint
ALTER TABLE "job" ADD COLUMN "return_address_chosen_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "owner_address" ADD CONSTRAINT "owner_address_owner_id_user_id_fk" FOREIGN KEY ("owner_id") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "owner_address_owner_idx" ON "owner_address" USING btree ("owner_id");--> statement-breakpoint
CREATE UNIQUE INDEX "owner_address_one_default_idx" ON "owner_address" USING btree ("owner_id") WHERE "owner_address"."is_default";