CREATE TABLE "notebook_run" (
	"id" text PRIMARY KEY NOT NULL,
	"notebook_id" text NOT NULL,
	"revision" integer NOT NULL,
	"bindings" jsonb NOT NULL,
	"label" text,
	"snapshot" jsonb NOT NULL,
	"cell_count" integer NOT NULL,
	"failed_cells" integer NOT NULL,
	"duration_ms" integer NOT NULL,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "publication" (
	"notebook_id" text PRIMARY KEY NOT NULL,
	"slug" text NOT NULL,
	"revision" integer NOT NULL,
	"snapshot" jsonb NOT NULL,
	"allow_downloads" boolean DEFAULT false NOT NULL,
	"published_by" text,
	"published_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "publication_slug_unique" UNIQUE("slug")
);
--> statement-breakpoint
CREATE TABLE "share_link" (
	"token" text PRIMARY KEY NOT NULL,
	"notebook_id" text NOT NULL,
	"members_only" boolean DEFAULT false NOT NULL,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "notebook_run" ADD CONSTRAINT "notebook_run_notebook_id_notebook_id_fk" FOREIGN KEY ("notebook_id") REFERENCES "public"."notebook"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "notebook_run" ADD CONSTRAINT "notebook_run_created_by_user_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "publication" ADD CONSTRAINT "publication_notebook_id_notebook_id_fk" FOREIGN KEY ("notebook_id") REFERENCES "public"."notebook"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "publication" ADD CONSTRAINT "publication_published_by_user_id_fk" FOREIGN KEY ("published_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "share_link" ADD CONSTRAINT "share_link_notebook_id_notebook_id_fk" FOREIGN KEY ("notebook_id") REFERENCES "public"."notebook"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "share_link" ADD CONSTRAINT "share_link_created_by_user_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "notebook_run_notebook_idx" ON "notebook_run" USING btree ("notebook_id","created_at");--> statement-breakpoint
CREATE INDEX "share_link_notebook_idx" ON "share_link" USING btree ("notebook_id");