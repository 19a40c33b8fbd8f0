ALTER TABLE "network_settings" ADD COLUMN "worst_case_ambient_c" double precision DEFAULT 35 NOT NULL;--> statement-breakpoint
ALTER TABLE "network_settings" ADD COLUMN "fade_margin_k" double precision DEFAULT 50 NOT NULL;--> statement-breakpoint
ALTER TABLE "network_settings" ADD COLUMN "max_road_grade_percent" double precision DEFAULT 15 NOT NULL;--> statement-breakpoint
ALTER TABLE "network_settings" ADD COLUMN "crawl_speed_kph" double precision DEFAULT 5 NOT NULL;--> statement-breakpoint
ALTER TABLE "network_settings" ADD COLUMN "crawl_distance_m" double precision DEFAULT 200 NOT NULL;