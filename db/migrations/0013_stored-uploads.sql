CREATE TABLE "stored_upload" (
	"key" text PRIMARY KEY NOT NULL,
	"thumb_key" text,
	"uploader_id" text NOT NULL,
	"bytes" integer NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "stored_upload" ADD CONSTRAINT "stored_upload_uploader_id_user_id_fk" FOREIGN KEY ("uploader_id") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "stored_upload_uploader_idx" ON "stored_upload" USING btree ("uploader_id","created_at");--> statement-breakpoint
CREATE INDEX "stored_upload_created_idx" ON "stored_upload" USING btree ("created_at");