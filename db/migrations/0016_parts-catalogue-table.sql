CREATE TABLE "part_stock_take" (
	"job_id" uuid NOT NULL,
	"part_id" uuid NOT NULL,
	"quantity" integer NOT NULL,
	CONSTRAINT "part_stock_take_job_id_part_id_pk" PRIMARY KEY("job_id","part_id")
);
--> statement-breakpoint
CREATE TABLE "part" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"code" text,
	"name" text NOT NULL,
	"supplier_ref" text,
	"cost_minor" integer NOT NULL,
	"markup_bp" integer,
	"stock" integer,
	"retired_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"created_by" text,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_by" text,
	CONSTRAINT "part_cost_check" CHECK ("part"."cost_minor" >= 0),
	CONSTRAINT "part_markup_check" CHECK ("part"."markup_bp" is null or "part"."markup_bp" >= 0)
);
--> statement-breakpoint
ALTER TABLE "estimate_line" ADD COLUMN "part_id" uuid;--> statement-breakpoint
ALTER TABLE "part_stock_take" ADD CONSTRAINT "part_stock_take_job_id_job_id_fk" FOREIGN KEY ("job_id") REFERENCES "public"."job"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "part_stock_take" ADD CONSTRAINT "part_stock_take_part_id_part_id_fk" FOREIGN KEY ("part_id") REFERENCES "public"."part"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "part" ADD CONSTRAINT "part_created_by_user_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "part" ADD CONSTRAINT "part_updated_by_user_id_fk" FOREIGN KEY ("updated_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "part_stock_take_part_idx" ON "part_stock_take" USING btree ("part_id");--> statement-breakpoint
CREATE UNIQUE INDEX "part_code_idx" ON "part" USING btree ("code");--> statement-breakpoint
ALTER TABLE "estimate_line" ADD CONSTRAINT "estimate_line_part_id_part_id_fk" FOREIGN KEY ("part_id") REFERENCES "public"."part"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
-- The catalogue moves out of the shop policy into the part table, keeping the shop's own names, costs and markups.
INSERT INTO "part" ("code", "name", "cost_minor", "markup_bp")
SELECT e.key, left(coalesce(nullif(trim(e.value->>'title'), ''), e.key), 120), greatest(0, (e.value->>'costMinor')::integer), (e.value->>'markupBp')::integer
FROM "shop_settings" s, jsonb_each(coalesce(s."policy"->'parts'->'catalogue', '{}'::jsonb)) e
WHERE s."id" = 'shop' AND jsonb_typeof(e.value->'costMinor') = 'number'
ON CONFLICT ("code") DO NOTHING;
--> statement-breakpoint
-- The parts the checklist rules call for, at the seeded costs (USD minor units), where the shop had no entry.
INSERT INTO "part" ("code", "name", "cost_minor") VALUES
  ('cap.electrolytic', 'Electrolytic capacitor, new', 450),
  ('cap.film', 'Film capacitor (replaces paper)', 120),
  ('cap.y2', 'Y2-class safety capacitor', 150),
  ('plug.polarized', 'Polarized plug', 600),
  ('fuse.holder', 'In-line fuse holder', 350),
  ('fuse', 'Fuse', 50),
  ('cord.line', 'Line cord, two-wire polarized', 900),
  ('diode.silicon', 'Silicon rectifier diode', 40),
  ('resistor.series', 'Series resistor (selenium replacement)', 60),
  ('cord.dial', 'Dial cord and spring', 300),
  ('battery.contacts', 'Battery contacts', 500)
ON CONFLICT ("code") DO NOTHING;
--> statement-breakpoint
UPDATE "shop_settings" SET "policy" = "policy" #- '{parts,catalogue}' WHERE "policy"->'parts' ? 'catalogue';
--> statement-breakpoint
-- Part lines already sent name their catalogue part ("part.<code>" or "part.<code>.<n>").
UPDATE "estimate_line" l SET "part_id" = p."id"
FROM "part" p
WHERE p."code" IS NOT NULL AND l."part_id" IS NULL
  AND l."code" ~ ('^part\.' || replace(p."code", '.', '\.') || '(\.[0-9]+)?$');
