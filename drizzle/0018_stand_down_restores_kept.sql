-- Restores are history like the stand-downs they undo: never changed, never removed, except with
-- their venue or when the stand-down they undo goes with its prop.
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
		IF TG_TABLE_NAME = 'stand_down_restores' THEN
			IF NOT EXISTS (SELECT 1 FROM stand_downs WHERE id = OLD.stand_down_id) THEN
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
--> statement-breakpoint
CREATE TRIGGER stand_down_restores_append_only BEFORE UPDATE OR DELETE ON stand_down_restores
	FOR EACH ROW EXECUTE FUNCTION gloaming_refuse_history_change();
