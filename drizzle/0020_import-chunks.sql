CREATE TABLE "import_chunks" (
	"import_id" uuid NOT NULL,
	"seq" integer NOT NULL,
	"bytes" "bytea" NOT NULL,
	CONSTRAINT "import_chunks_import_id_seq_pk" PRIMARY KEY("import_id","seq")
);
--> statement-breakpoint
ALTER TABLE "import_chunks" ADD CONSTRAINT "import_chunks_import_id_imports_id_fk" FOREIGN KEY ("import_id") REFERENCES "public"."imports"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
-- Uncompressed: the pieces live minutes, and compressing them would make the upload wait.
ALTER TABLE "import_chunks" ALTER COLUMN "bytes" SET STORAGE EXTERNAL;--> statement-breakpoint
-- Imports still waiting for a worker keep their bytes, as one piece.
INSERT INTO "import_chunks" ("import_id", "seq", "bytes") SELECT "id", 0, "bytes" FROM "imports" WHERE "bytes" IS NOT NULL;--> statement-breakpoint
ALTER TABLE "imports" DROP COLUMN "bytes";
