CREATE TABLE "message_read" (
	"job_id" uuid NOT NULL,
	"user_id" text NOT NULL,
	"read_up_to" timestamp with time zone NOT NULL,
	CONSTRAINT "message_read_job_id_user_id_pk" PRIMARY KEY("job_id","user_id")
);
--> statement-breakpoint
ALTER TABLE "photo" ADD COLUMN "message_id" uuid;--> statement-breakpoint
ALTER TABLE "message_read" ADD CONSTRAINT "message_read_job_id_job_id_fk" FOREIGN KEY ("job_id") REFERENCES "public"."job"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "message_read" ADD CONSTRAINT "message_read_user_id_user_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "photo" ADD CONSTRAINT "photo_message_id_message_id_fk" FOREIGN KEY ("message_id") REFERENCES "public"."message"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "photo_message_idx" ON "photo" USING btree ("message_id");