-- Check history outlives the season, night and checklist line it belongs to. A foreign-key action
-- may still clear a person from a row (UPDATE ... SET NULL when an account goes) and may delete the
-- rows when their venue is removed (told apart by the venue's row being gone already when the
-- cascade reaches the history row), or a stand-down when its prop is removed. Any other removal
-- that would take history with it (a season, a show, a checklist line) is refused.
CREATE OR REPLACE FUNCTION gloaming_refuse_history_change() RETURNS trigger AS $$
BEGIN
	IF pg_trigger_depth() > 1 AND TG_OP = 'UPDATE' THEN
		RETURN NEW;
	END IF;
	IF pg_trigger_depth() > 1 AND TG_OP = 'DELETE' THEN
		IF NOT EXISTS (SELECT 1 FROM venues WHERE id = OLD.venue_id) THEN
			RETURN OLD;
		END IF;
		IF TG_TABLE_NAME = 'stand_downs' THEN
			IF NOT EXISTS (SELECT 1 FROM props WHERE id = OLD.prop_id) THEN
				RETURN OLD;
			END IF;
		END IF;
		RAISE EXCEPTION '% is kept for good: a night with recorded checks cannot be removed', TG_TABLE_NAME
			USING ERRCODE = 'restrict_violation';
	END IF;
	RAISE EXCEPTION '% is append-only: record a new entry instead of changing one', TG_TABLE_NAME
		USING ERRCODE = 'restrict_violation';
END;
$$ LANGUAGE plpgsql;
