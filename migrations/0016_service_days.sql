CREATE TABLE "service_day_results" (
	"service_day_id" uuid PRIMARY KEY NOT NULL,
	"status" text DEFAULT 'queued' NOT NULL,
	"failure_reason" text,
	"job_id" text,
	"claim_token" uuid,
	"heartbeat_at" timestamp with time zone,
	"queued_at" timestamp with time zone DEFAULT now() NOT NULL,
	"started_at" timestamp with time zone,
	"engine_version" text,
	"computed_at" timestamp with time zone,
	"provenance" jsonb,
	"result" jsonb
);
--> statement-breakpoint
CREATE TABLE "service_days" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"day_type" text NOT NULL,
	"season" text NOT NULL,
	"battery_age" text NOT NULL,
	"reserve_soc" double precision NOT NULL,
	"in_service" boolean DEFAULT false NOT NULL,
	"chargers" jsonb NOT NULL,
	"blocks" jsonb NOT NULL,
	"revision" integer DEFAULT 1 NOT NULL,
	"seed_key" text,
	"created_by_id" uuid,
	"created_by_name" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"deleted_at" timestamp with time zone,
	"deleted_by_id" uuid,
	"deleted_by_name" text,
	CONSTRAINT "service_days_seedKey_unique" UNIQUE("seed_key")
);
--> statement-breakpoint
ALTER TABLE "network_settings" ADD COLUMN "day_counts" jsonb DEFAULT '{"weekday":{"winter":62,"mild":125,"summer":63},"saturday":{"winter":13,"mild":26,"summer":13},"sunday-holiday":{"winter":15,"mild":32,"summer":16}}'::jsonb NOT NULL;--> statement-breakpoint
ALTER TABLE "network_settings" ADD COLUMN "co2_reference_vehicle" jsonb DEFAULT '{"name":"Diesel city bus, 12 m (illustrative placeholder)","consumptionPerKm":0.45,"consumptionUnit":"l-diesel","emissionFactorKgPerUnit":2.68,"source":"Illustrative placeholder, from memory and not checked: about 45 l/100 km for a 12 m diesel city bus on hilly routes, and 2.68 kg CO2 per litre (the US EPA emission factors give 10.21 kg per US gallon). Replace with your own fleet’s consumption and a named factor."}'::jsonb NOT NULL;--> statement-breakpoint
ALTER TABLE "service_day_results" ADD CONSTRAINT "service_day_results_service_day_id_service_days_id_fk" FOREIGN KEY ("service_day_id") REFERENCES "public"."service_days"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "service_days" ADD CONSTRAINT "service_days_created_by_id_users_id_fk" FOREIGN KEY ("created_by_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "service_days_day_type_season_idx" ON "service_days" USING btree ("day_type","season");