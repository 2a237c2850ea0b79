CREATE TABLE "joint_logs" (
	"id" serial PRIMARY KEY NOT NULL,
	"team_id" integer NOT NULL,
	"scenario_id" integer NOT NULL,
	"owner_id" integer NOT NULL,
	"name" text NOT NULL,
	"file_name" text NOT NULL,
	"read_options" jsonb NOT NULL,
	"sample_count" integer NOT NULL,
	"time_samples" "bytea" NOT NULL,
	"angle_samples" "bytea",
	"velocity_samples" "bytea",
	"setpoint_samples" "bytea",
	"torque_samples" "bytea",
	"parse_report" jsonb NOT NULL,
	"fit_report" jsonb,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "joint_logs_sample_lengths" CHECK ("joint_logs"."sample_count" >= 2 and octet_length("joint_logs"."time_samples") = 8 * "joint_logs"."sample_count"
        and ("joint_logs"."angle_samples" is null or octet_length("joint_logs"."angle_samples") = 8 * "joint_logs"."sample_count")
        and ("joint_logs"."velocity_samples" is null or octet_length("joint_logs"."velocity_samples") = 8 * "joint_logs"."sample_count")
        and ("joint_logs"."setpoint_samples" is null or octet_length("joint_logs"."setpoint_samples") = 8 * "joint_logs"."sample_count")
        and ("joint_logs"."torque_samples" is null or octet_length("joint_logs"."torque_samples") = 8 * "joint_logs"."sample_count"))
);
--> statement-breakpoint
ALTER TABLE "joint_logs" ADD CONSTRAINT "joint_logs_team_id_teams_id_fk" FOREIGN KEY ("team_id") REFERENCES "public"."teams"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "joint_logs" ADD CONSTRAINT "joint_logs_scenario_id_scenarios_id_fk" FOREIGN KEY ("scenario_id") REFERENCES "public"."scenarios"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "joint_logs" ADD CONSTRAINT "joint_logs_owner_id_users_id_fk" FOREIGN KEY ("owner_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "joint_logs_scenario_idx" ON "joint_logs" USING btree ("scenario_id","created_at");--> statement-breakpoint
CREATE INDEX "joint_logs_team_idx" ON "joint_logs" USING btree ("team_id");