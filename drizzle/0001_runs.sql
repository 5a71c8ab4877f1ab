CREATE TYPE "public"."analysis_mode" AS ENUM('sequential', 'refit');--> statement-breakpoint
CREATE TYPE "public"."analysis_state" AS ENUM('queued', 'running', 'done', 'failed');--> statement-breakpoint
CREATE TYPE "public"."run_disposition" AS ENUM('accepted', 'on_hold', 'rejected');--> statement-breakpoint
CREATE TYPE "public"."run_status" AS ENUM('uploaded', 'analysed', 'failed');--> statement-breakpoint
CREATE TABLE "analyses" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "analyses_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"run_id" integer NOT NULL,
	"mode" "analysis_mode" NOT NULL,
	"settings" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"state" "analysis_state" DEFAULT 'queued' NOT NULL,
	"error" text,
	"requested_by" integer,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"started_at" timestamp with time zone,
	"finished_at" timestamp with time zone,
	"warnings" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"summary" jsonb
);
--> statement-breakpoint
CREATE TABLE "design_revisions" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "design_revisions_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"design_id" integer NOT NULL,
	"revision" integer NOT NULL,
	"document" jsonb NOT NULL,
	"source_file_name" text,
	"name" text NOT NULL,
	"reference_wavelength_nm" double precision NOT NULL,
	"layer_count" integer NOT NULL,
	"created_by" integer,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "designs" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "designs_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"name" text NOT NULL,
	"created_by" integer,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "designs_name_unique" UNIQUE("name")
);
--> statement-breakpoint
CREATE TABLE "layer_results" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "layer_results_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"analysis_id" integer NOT NULL,
	"layer" integer NOT NULL,
	"material" text NOT NULL,
	"thickness_nm" double precision NOT NULL,
	"thickness_sigma_nm" double precision NOT NULL,
	"index" double precision NOT NULL,
	"index_sigma" double precision NOT NULL,
	"rate_nm_per_s" double precision NOT NULL,
	"cut_error_qwot_pct" double precision NOT NULL,
	"residual_rms" double precision NOT NULL,
	"detail" jsonb DEFAULT '{}'::jsonb NOT NULL
);
--> statement-breakpoint
CREATE TABLE "runs" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "runs_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"design_revision_id" integer NOT NULL,
	"chamber_id" integer NOT NULL,
	"run_code" text NOT NULL,
	"shift" text,
	"operator_id" integer,
	"operator_name" text,
	"started_at" timestamp with time zone,
	"status" "run_status" DEFAULT 'uploaded' NOT NULL,
	"disposition" "run_disposition",
	"disposition_reason" text,
	"disposition_by" integer,
	"disposition_at" timestamp with time zone,
	"uploaded_by" integer,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "trace_files" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "trace_files_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"run_id" integer NOT NULL,
	"file_name" text NOT NULL,
	"byte_size" integer NOT NULL,
	"sha256" text NOT NULL,
	"bytes" "bytea" NOT NULL,
	"row_count" integer NOT NULL,
	"columns" text[] NOT NULL,
	"meta" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "trace_files_run_id_unique" UNIQUE("run_id")
);
--> statement-breakpoint
ALTER TABLE "analyses" ADD CONSTRAINT "analyses_run_id_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."runs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "analyses" ADD CONSTRAINT "analyses_requested_by_users_id_fk" FOREIGN KEY ("requested_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "design_revisions" ADD CONSTRAINT "design_revisions_design_id_designs_id_fk" FOREIGN KEY ("design_id") REFERENCES "public"."designs"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "design_revisions" ADD CONSTRAINT "design_revisions_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "designs" ADD CONSTRAINT "designs_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "layer_results" ADD CONSTRAINT "layer_results_analysis_id_analyses_id_fk" FOREIGN KEY ("analysis_id") REFERENCES "public"."analyses"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "runs" ADD CONSTRAINT "runs_design_revision_id_design_revisions_id_fk" FOREIGN KEY ("design_revision_id") REFERENCES "public"."design_revisions"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "runs" ADD CONSTRAINT "runs_chamber_id_chambers_id_fk" FOREIGN KEY ("chamber_id") REFERENCES "public"."chambers"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "runs" ADD CONSTRAINT "runs_operator_id_users_id_fk" FOREIGN KEY ("operator_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "runs" ADD CONSTRAINT "runs_disposition_by_users_id_fk" FOREIGN KEY ("disposition_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "runs" ADD CONSTRAINT "runs_uploaded_by_users_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trace_files" ADD CONSTRAINT "trace_files_run_id_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."runs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "analyses_run_idx" ON "analyses" USING btree ("run_id","mode");--> statement-breakpoint
CREATE INDEX "analyses_requested_by_idx" ON "analyses" USING btree ("requested_by");--> statement-breakpoint
CREATE UNIQUE INDEX "design_revisions_design_revision_idx" ON "design_revisions" USING btree ("design_id","revision");--> statement-breakpoint
CREATE INDEX "design_revisions_created_by_idx" ON "design_revisions" USING btree ("created_by");--> statement-breakpoint
CREATE INDEX "designs_created_by_idx" ON "designs" USING btree ("created_by");--> statement-breakpoint
CREATE UNIQUE INDEX "layer_results_analysis_layer_idx" ON "layer_results" USING btree ("analysis_id","layer");--> statement-breakpoint
CREATE UNIQUE INDEX "runs_chamber_code_idx" ON "runs" USING btree ("chamber_id","run_code");--> statement-breakpoint
CREATE INDEX "runs_design_revision_idx" ON "runs" USING btree ("design_revision_id");--> statement-breakpoint
CREATE INDEX "runs_operator_idx" ON "runs" USING btree ("operator_id");--> statement-breakpoint
CREATE INDEX "runs_uploaded_by_idx" ON "runs" USING btree ("uploaded_by");--> statement-breakpoint
CREATE INDEX "runs_disposition_by_idx" ON "runs" USING btree ("disposition_by");--> statement-breakpoint
CREATE INDEX "runs_started_at_idx" ON "runs" USING btree ("started_at");--> statement-breakpoint
CREATE INDEX "trace_files_sha256_idx" ON "trace_files" USING btree ("sha256");