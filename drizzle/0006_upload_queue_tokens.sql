CREATE TABLE "chamber_tokens" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "chamber_tokens_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"chamber_id" integer NOT NULL,
	"label" text NOT NULL,
	"token_hash" text NOT NULL,
	"hint" text NOT NULL,
	"created_by" integer,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"last_used_at" timestamp with time zone,
	"revoked_at" timestamp with time zone,
	"revoked_by" integer,
	CONSTRAINT "chamber_tokens_token_hash_unique" UNIQUE("token_hash")
);
--> statement-breakpoint
CREATE TABLE "trace_file_chunks" (
	"trace_file_id" integer NOT NULL,
	"seq" integer NOT NULL,
	"bytes" "bytea" NOT NULL,
	CONSTRAINT "trace_file_chunks_trace_file_id_seq_pk" PRIMARY KEY("trace_file_id","seq")
);
--> statement-breakpoint
ALTER TABLE "trace_files" ALTER COLUMN "run_id" DROP NOT NULL;--> statement-breakpoint
ALTER TABLE "analyses" ADD COLUMN "attempt" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "analyses" ADD COLUMN "cuts_outside_tolerance" integer;--> statement-breakpoint
ALTER TABLE "chamber_tokens" ADD CONSTRAINT "chamber_tokens_chamber_id_chambers_id_fk" FOREIGN KEY ("chamber_id") REFERENCES "public"."chambers"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "chamber_tokens" ADD CONSTRAINT "chamber_tokens_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "chamber_tokens" ADD CONSTRAINT "chamber_tokens_revoked_by_users_id_fk" FOREIGN KEY ("revoked_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trace_file_chunks" ADD CONSTRAINT "trace_file_chunks_trace_file_id_trace_files_id_fk" FOREIGN KEY ("trace_file_id") REFERENCES "public"."trace_files"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "chamber_tokens_chamber_idx" ON "chamber_tokens" USING btree ("chamber_id");--> statement-breakpoint
CREATE INDEX "chamber_tokens_created_by_idx" ON "chamber_tokens" USING btree ("created_by");--> statement-breakpoint
CREATE INDEX "chamber_tokens_revoked_by_idx" ON "chamber_tokens" USING btree ("revoked_by");--> statement-breakpoint
-- Added by hand to the generated file: a database from before this migration keeps its raw traces (one chunk each).
INSERT INTO "trace_file_chunks" ("trace_file_id", "seq", "bytes") SELECT "id", 0, "bytes" FROM "trace_files" WHERE "bytes" IS NOT NULL;--> statement-breakpoint
ALTER TABLE "trace_files" DROP COLUMN "bytes";