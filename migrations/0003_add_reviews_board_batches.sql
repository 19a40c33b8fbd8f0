CREATE TABLE "review_events" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"review_id" uuid NOT NULL,
	"actor_id" uuid,
	"actor_name" text NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"from_state" text,
	"to_state" text NOT NULL,
	"note" text,
	"details" jsonb
);
--> statement-breakpoint
CREATE TABLE "review_items" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"state" text DEFAULT 'raised' NOT NULL,
	"route_id" uuid NOT NULL,
	"route_name" text NOT NULL,
	"vehicle_profile_id" uuid NOT NULL,
	"vehicle_profile_name" text NOT NULL,
	"direction" text NOT NULL,
	"scenario_id" uuid NOT NULL,
	"scenario_name" text NOT NULL,
	"start_m" double precision NOT NULL,
	"end_m" double precision NOT NULL,
	"mean_grade_percent" double precision NOT NULL,
	"risk" text NOT NULL,
	"risk_rank" integer NOT NULL,
	"raised_risk" text NOT NULL,
	"peak_brake_temp_c" double precision NOT NULL,
	"descent" jsonb NOT NULL,
	"sources" jsonb NOT NULL,
	"mitigation" jsonb,
	"mitigated_risk" text,
	"mitigated_peak_brake_temp_c" double precision,
	"acceptance_reason" text,
	"raised_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "review_items_stretch_check" CHECK ("review_items"."end_m" > "review_items"."start_m")
);
--> statement-breakpoint
CREATE TABLE "network_settings" (
	"key" text PRIMARY KEY DEFAULT 'network' NOT NULL,
	"energy_tariff_per_k_wh" double precision NOT NULL,
	"currency" text NOT NULL,
	"tariff_source" text NOT NULL,
	"grid_emission_factor_kg_per_k_wh" double precision NOT NULL,
	"emission_factor_source" text NOT NULL,
	"updated_by_id" uuid,
	"updated_by_name" text,
	"updated_at" timestamp with time zone,
	CONSTRAINT "network_settings_single_row_check" CHECK ("network_settings"."key" = 'network')
);
--> statement-breakpoint
CREATE TABLE "batch_run_items" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"batch_run_id" uuid NOT NULL,
	"scenario_id" uuid NOT NULL,
	"scenario_name" text NOT NULL,
	"status" text DEFAULT 'queued' NOT NULL,
	"error" text,
	"started_at" timestamp with time zone,
	"finished_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "batch_runs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"started_by_id" uuid,
	"started_by_name" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"finished_at" timestamp with time zone
);
--> statement-breakpoint
ALTER TABLE "review_events" ADD CONSTRAINT "review_events_review_id_review_items_id_fk" FOREIGN KEY ("review_id") REFERENCES "public"."review_items"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "batch_run_items" ADD CONSTRAINT "batch_run_items_batch_run_id_batch_runs_id_fk" FOREIGN KEY ("batch_run_id") REFERENCES "public"."batch_runs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "review_events_review_id_idx" ON "review_events" USING btree ("review_id","at");--> statement-breakpoint
CREATE INDEX "review_items_key_idx" ON "review_items" USING btree ("route_id","direction","vehicle_profile_id");--> statement-breakpoint
CREATE INDEX "review_items_state_idx" ON "review_items" USING btree ("state");--> statement-breakpoint
CREATE UNIQUE INDEX "batch_run_items_batch_scenario_key" ON "batch_run_items" USING btree ("batch_run_id","scenario_id");--> statement-breakpoint
CREATE INDEX "batch_run_items_status_idx" ON "batch_run_items" USING btree ("batch_run_id","status");