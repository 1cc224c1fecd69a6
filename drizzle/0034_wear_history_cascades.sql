-- PL/pgSQL does not stop at the first false test of an AND, so each table reads only its own
-- parent column: a cascade from a removed output reached show_id on maintenance_records.
CREATE OR REPLACE FUNCTION gloaming_refuse_wear_change() RETURNS trigger AS $$
BEGIN
	IF pg_trigger_depth() > 1 AND TG_OP = 'DELETE' THEN
		IF NOT EXISTS (SELECT 1 FROM venues WHERE id = OLD.venue_id) THEN
			RETURN OLD;
		END IF;
		IF TG_TABLE_NAME IN ('guest_counts', 'close_results', 'close_sign_offs') THEN
			IF NOT EXISTS (SELECT 1 FROM shows WHERE id = OLD.show_id) THEN
				RETURN OLD;
			END IF;
		ELSIF TG_TABLE_NAME IN ('wear_settings', 'maintenance_records') THEN
			IF NOT EXISTS (SELECT 1 FROM outputs WHERE id = OLD.output_id) THEN
				RETURN OLD;
			END IF;
		END IF;
	END IF;
	RAISE EXCEPTION '% is append-only: record a new entry instead of changing one', TG_TABLE_NAME
		USING ERRCODE = 'restrict_violation';
END;
$$ LANGUAGE plpgsql;
