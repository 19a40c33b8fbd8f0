ALTER TABLE "review_items" ADD COLUMN "acceptance_proposed_by_id" uuid;--> statement-breakpoint
ALTER TABLE "review_items" ADD COLUMN "acceptance_proposed_by_name" text;--> statement-breakpoint
ALTER TABLE "review_items" ADD COLUMN "acceptance_proposed_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "review_items" ADD COLUMN "acceptance_signed_off_by_id" uuid;--> statement-breakpoint
ALTER TABLE "review_items" ADD COLUMN "acceptance_signed_off_by_name" text;--> statement-breakpoint
ALTER TABLE "review_items" ADD COLUMN "acceptance_signed_off_at" timestamp with time zone;