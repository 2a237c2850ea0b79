CREATE TABLE "joint_log_signals" (
	"log_id" integer NOT NULL,
	"signal" text NOT NULL,
	"samples" "bytea" NOT NULL,
	CONSTRAINT "joint_log_signals_log_id_signal_pk" PRIMARY KEY("log_id","signal"),
	CONSTRAINT "joint_log_signals_signal" CHECK ("joint_log_signals"."signal" in ('time', 'angle', 'velocity', 'setpoint', 'torque')),
	CONSTRAINT "joint_log_signals_whole_samples" CHECK (octet_length("joint_log_signals"."samples") >= 16 and octet_length("joint_log_signals"."samples") % 8 = 0)
);
--> statement-breakpoint
CREATE TABLE "joint_logs" (
	"id" serial PRIMARY KEY NOT NULL,
	"team_id" integer NOT NULL,
	"scenario_id" integer NOT NULL,
	"owner_id" integer NOT NULL,
	"name" text NOT NULL,
	"file_name" text NOT NULL,
	"read_options" jsonb NOT NULL,
	"sample_count" integer NOT NULL,
	"parse_report" jsonb NOT NULL,
	"fit_report" jsonb,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "joint_logs_sample_count" CHECK ("joint_logs"."sample_count" >= 2)
);
--> statement-breakpoint
ALTER TABLE "joint_log_signals" ADD CONSTRAINT "joint_log_signals_log_id_joint_logs_id_fk" FOREIGN KEY ("log_id") REFERENCES "public"."joint_logs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "joint_logs" ADD CONSTRAINT "joint_logs_team_id_teams_id_fk" FOREIGN KEY ("team_id") REFERENCES "public"."teams"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "joint_logs" ADD CONSTRAINT "joint_logs_scenario_id_scenarios_id_fk" FOREIGN KEY ("scenario_id") REFERENCES "public"."scenarios"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "joint_logs" ADD CONSTRAINT "joint_logs_owner_id_users_id_fk" FOREIGN KEY ("owner_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "joint_logs_scenario_idx" ON "joint_logs" USING btree ("scenario_id","created_at");--> statement-breakpoint
CREATE INDEX "joint_logs_team_idx" ON "joint_logs" USING btree ("team_id");