CREATE TABLE "attempt_throttles" (
	"key" text PRIMARY KEY NOT NULL,
	"email" text,
	"attempts" integer DEFAULT 0 NOT NULL,
	"last_attempt_at" timestamp with time zone DEFAULT now() NOT NULL,
	"blocked_until" timestamp with time zone
);
--> statement-breakpoint
DROP TABLE "login_failures" CASCADE;--> statement-breakpoint
CREATE INDEX "attempt_throttles_email_idx" ON "attempt_throttles" USING btree ("email");--> statement-breakpoint
CREATE INDEX "attempt_throttles_last_attempt_idx" ON "attempt_throttles" USING btree ("last_attempt_at");