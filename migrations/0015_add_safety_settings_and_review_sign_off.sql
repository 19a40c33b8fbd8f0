ALTER TABLE "review_items" ADD COLUMN "acceptance_proposed_by_id" uuid;--> statement-breakpoint
ALTER TABLE "review_items" ADD COLUMN "acceptance_proposed_by_name" text;--> statement-breakpoint
ALTER TABLE "review_items" ADD COLUMN "acceptance_proposed_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "review_items" ADD COLUMN "acceptance_signed_off_by_id" uuid;--> statement-breakpoint
ALTER TABLE "review_items" ADD COLUMN "acceptance_signed_off_by_name" text;--> statement-breakpoint
ALTER TABLE "review_items" ADD COLUMN "acceptance_signed_off_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "network_settings" ADD COLUMN "worst_case_ambient_c" double precision DEFAULT 35 NOT NULL;--> statement-breakpoint
ALTER TABLE "network_settings" ADD COLUMN "fade_margin_k" double precision DEFAULT 50 NOT NULL;--> statement-breakpoint
ALTER TABLE "network_settings" ADD COLUMN "max_road_grade_percent" double precision DEFAULT 15 NOT NULL;--> statement-breakpoint
ALTER TABLE "network_settings" ADD COLUMN "crawl_speed_kph" double precision DEFAULT 5 NOT NULL;--> statement-breakpoint
ALTER TABLE "network_settings" ADD COLUMN "crawl_distance_m" double precision DEFAULT 200 NOT NULL;