CREATE TABLE "sign_in_limits" (
	"key" varchar(255) PRIMARY KEY NOT NULL,
	"points" integer DEFAULT 0 NOT NULL,
	"expire" bigint
);
--> statement-breakpoint
CREATE INDEX "sign_in_limits_expire_idx" ON "sign_in_limits" USING btree ("expire");