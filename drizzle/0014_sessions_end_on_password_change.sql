-- A new password ends every session of the person, whichever code or hand changed it.
CREATE FUNCTION end_sessions_on_new_password() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
	DELETE FROM sessions WHERE user_id = NEW.id;
	RETURN NEW;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER users_new_password_ends_sessions
	AFTER UPDATE OF password_hash ON users
	FOR EACH ROW
	WHEN (OLD.password_hash IS DISTINCT FROM NEW.password_hash)
	EXECUTE FUNCTION end_sessions_on_new_password();
