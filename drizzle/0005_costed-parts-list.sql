ALTER TABLE "part_line" ADD COLUMN "rating_v_ac" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "part_line" ADD COLUMN "mpn" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "part_line" ADD COLUMN "supplier" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "part_line" ADD COLUMN "unit_price" numeric(14, 4);--> statement-breakpoint
ALTER TABLE "part_line" ADD COLUMN "currency" text;--> statement-breakpoint
ALTER TABLE "part_line" ADD COLUMN "per_channel" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "part_line" ADD CONSTRAINT "part_line_price_check" CHECK ("part_line"."unit_price" is null or ("part_line"."unit_price" >= 0 and "part_line"."currency" ~ '^[A-Z]{3}$'));