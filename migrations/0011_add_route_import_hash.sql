ALTER TABLE "road_routes" ADD COLUMN "import_sha256" text;--> statement-breakpoint
ALTER TABLE "road_routes" ADD CONSTRAINT "road_routes_importSha256_unique" UNIQUE("import_sha256");