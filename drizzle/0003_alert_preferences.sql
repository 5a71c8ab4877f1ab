CREATE TABLE "alert_preferences" (
	"user_id" integer PRIMARY KEY NOT NULL,
	"out_of_tolerance" boolean DEFAULT false NOT NULL,
	"control_rules" boolean DEFAULT false NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "alert_preferences" ADD CONSTRAINT "alert_preferences_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;