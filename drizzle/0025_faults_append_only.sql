-- Faults and what happened to them are history like check results: never changed, never removed,
-- except with their venue or when the prop they are about goes (and a fault's events with it).
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
		IF TG_TABLE_NAME = 'faults' THEN
			IF NOT EXISTS (SELECT 1 FROM props WHERE id = OLD.prop_id) THEN
				RETURN OLD;
			END IF;
		END IF;
		IF TG_TABLE_NAME = 'fault_events' THEN
			IF NOT EXISTS (SELECT 1 FROM faults WHERE id = OLD.fault_id) THEN
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
CREATE TRIGGER faults_append_only BEFORE UPDATE OR DELETE ON faults
	FOR EACH ROW EXECUTE FUNCTION gloaming_refuse_history_change();
--> statement-breakpoint
CREATE TRIGGER fault_events_append_only BEFORE UPDATE OR DELETE ON fault_events
	FOR EACH ROW EXECUTE FUNCTION gloaming_refuse_history_change();
