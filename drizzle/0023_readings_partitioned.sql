-- Raw readings from the boards, one partition per UTC day (native range partitioning on "day").
-- No foreign keys: a reading is checked against its key's controller when it arrives, and old
-- partitions are dropped whole by the rollup job (src/lib/server/boards/rollup.ts).
-- (sensor, seq, day) is unique so a batch sent twice the same day stores once; the ingest also
-- skips sequence numbers already stored the day before.
CREATE TABLE "readings" (
	"venue_id" uuid NOT NULL,
	"controller_id" uuid NOT NULL,
	"sensor_id" uuid NOT NULL,
	"seq" bigint NOT NULL,
	"value" double precision NOT NULL,
	"label" text,
	"at" timestamp with time zone NOT NULL,
	"day" date NOT NULL,
	CONSTRAINT "readings_sensor_seq_day" UNIQUE ("sensor_id", "seq", "day")
) PARTITION BY RANGE ("day");
--> statement-breakpoint
CREATE INDEX "readings_sensor_at" ON "readings" USING btree ("sensor_id", "at");
--> statement-breakpoint
-- Creates the day partitions readings_YYYYMMDD from first_day for days days; returns how many it made.
-- Safe to call from several app servers at once.
CREATE FUNCTION readings_add_partitions(first_day date, days integer) RETURNS integer
LANGUAGE plpgsql AS $$
DECLARE
	d date;
	made integer := 0;
	part text;
BEGIN
	FOR i IN 0..days - 1 LOOP
		d := first_day + i;
		part := 'readings_' || to_char(d, 'YYYYMMDD');
		IF to_regclass(part) IS NULL THEN
			BEGIN
				EXECUTE format(
					'CREATE TABLE %I PARTITION OF readings FOR VALUES FROM (%L) TO (%L)',
					part, d, d + 1
				);
				made := made + 1;
			EXCEPTION WHEN duplicate_table OR unique_violation THEN
				NULL;
			END;
		END IF;
	END LOOP;
	RETURN made;
END
$$;
--> statement-breakpoint
SELECT readings_add_partitions(((now() AT TIME ZONE 'UTC')::date) - 1, 9);
--> statement-breakpoint
INSERT INTO "reading_rollup_state" ("id", "through") VALUES (1, date_trunc('minute', now()));
