-- Guest counts, wear settings, maintenance records, close-of-night ticks and close sign-offs are
-- history like check results: never changed, never removed, except with their venue, their show
-- or their output (a cascade from the parent row).
CREATE OR REPLACE FUNCTION gloaming_refuse_wear_change() RETURNS trigger AS $$
BEGIN
	IF pg_trigger_depth() > 1 AND TG_OP = 'DELETE' THEN
		IF NOT EXISTS (SELECT 1 FROM venues WHERE id = OLD.venue_id) THEN
			RETURN OLD;
		END IF;
		IF TG_TABLE_NAME IN ('guest_counts', 'close_results', 'close_sign_offs')
			AND NOT EXISTS (SELECT 1 FROM shows WHERE id = OLD.show_id) THEN
			RETURN OLD;
		END IF;
		IF TG_TABLE_NAME IN ('wear_settings', 'maintenance_records')
			AND NOT EXISTS (SELECT 1 FROM outputs WHERE id = OLD.output_id) THEN
			RETURN OLD;
		END IF;
	END IF;
	RAISE EXCEPTION '% is append-only: record a new entry instead of changing one', TG_TABLE_NAME
		USING ERRCODE = 'restrict_violation';
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
DO $$
DECLARE
	t text;
BEGIN
	FOREACH t IN ARRAY ARRAY['guest_counts', 'wear_settings', 'maintenance_records', 'close_results',
		'close_sign_offs']
	LOOP
		EXECUTE format('CREATE TRIGGER %I BEFORE UPDATE OR DELETE ON %I
			FOR EACH ROW EXECUTE FUNCTION gloaming_refuse_wear_change()', t || '_append_only', t);
	END LOOP;
	-- A count, a rated interval or a maintenance record can make maintenance due or not: the
	-- pre-show checklists carry a line for it, so they are generated again.
	FOREACH t IN ARRAY ARRAY['guest_counts', 'wear_settings', 'maintenance_records']
	LOOP
		EXECUTE format('CREATE TRIGGER %I AFTER INSERT ON %I REFERENCING NEW TABLE AS changed_new
			FOR EACH STATEMENT EXECUTE FUNCTION gloaming_checklist_inputs_changed()', t || '_checklist_ins', t);
	END LOOP;
END;
$$;
