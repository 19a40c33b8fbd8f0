ALTER TABLE "scenarios" ADD COLUMN "result_version" integer DEFAULT 1 NOT NULL;--> statement-breakpoint
ALTER TABLE "review_items" ADD COLUMN "result_version" integer DEFAULT 1 NOT NULL;