ALTER TABLE "check_photos" ADD COLUMN "client_id" uuid;--> statement-breakpoint
ALTER TABLE "check_photos" ADD CONSTRAINT "check_photos_client_id_unique" UNIQUE("client_id");