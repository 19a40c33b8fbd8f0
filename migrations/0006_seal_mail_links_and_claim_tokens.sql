ALTER TABLE "mail_outbox" ADD COLUMN "sealed_link" text;--> statement-breakpoint
ALTER TABLE "mail_outbox" ADD COLUMN "claim_token" uuid;