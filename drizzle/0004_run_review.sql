CREATE TABLE "analysis_series" (
	"analysis_id" integer PRIMARY KEY NOT NULL,
	"model" "bytea" NOT NULL,
	"overview" jsonb NOT NULL
);
--> statement-breakpoint
CREATE TABLE "run_annotations" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "run_annotations_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"run_id" integer NOT NULL,
	"author_id" integer,
	"time_s" double precision,
	"layer" integer,
	"body" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "run_comments" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "run_comments_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"run_id" integer NOT NULL,
	"author_id" integer,
	"body" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "run_series" (
	"run_id" integer PRIMARY KEY NOT NULL,
	"sample_count" integer NOT NULL,
	"time_s" "bytea" NOT NULL,
	"signal" "bytea" NOT NULL,
	"time_index" "bytea" NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "analysis_series" ADD CONSTRAINT "analysis_series_analysis_id_analyses_id_fk" FOREIGN KEY ("analysis_id") REFERENCES "public"."analyses"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "run_annotations" ADD CONSTRAINT "run_annotations_run_id_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."runs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "run_annotations" ADD CONSTRAINT "run_annotations_author_id_users_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "run_comments" ADD CONSTRAINT "run_comments_run_id_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."runs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "run_comments" ADD CONSTRAINT "run_comments_author_id_users_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "run_series" ADD CONSTRAINT "run_series_run_id_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."runs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "run_annotations_run_idx" ON "run_annotations" USING btree ("run_id");--> statement-breakpoint
CREATE INDEX "run_annotations_author_idx" ON "run_annotations" USING btree ("author_id");--> statement-breakpoint
CREATE INDEX "run_comments_run_idx" ON "run_comments" USING btree ("run_id");--> statement-breakpoint
CREATE INDEX "run_comments_author_idx" ON "run_comments" USING btree ("author_id");