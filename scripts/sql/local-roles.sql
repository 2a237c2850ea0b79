-- The two roles of a Kinetwin database, made idempotently by scripts/local-postgres.sh and by the
-- tests' throwaway clusters (sim-server/testing/throwaway-cluster.ts). Run it as a superuser
-- connected to the database it prepares; the cluster's superuser then only administers.
--   kinetwin_owner  owns the schema and its objects; runs the migrations and the demo seed.
--   kinetwin_app    the server's pool: LOGIN and nothing else; the server grants it what
--                   sim-server/db/app-grants.ts lists after migrating.
-- Neither is a superuser or may create roles or databases, and the app role is no member of the
-- owner (so SET ROLE cannot lend it the owner's rights).
DO $$
BEGIN
  IF NOT EXISTS (SELECT FROM pg_roles WHERE rolname = 'kinetwin_owner') THEN
    CREATE ROLE kinetwin_owner;
  END IF;
  IF NOT EXISTS (SELECT FROM pg_roles WHERE rolname = 'kinetwin_app') THEN
    CREATE ROLE kinetwin_app;
  END IF;
END
$$;
ALTER ROLE kinetwin_owner LOGIN NOSUPERUSER NOCREATEDB NOCREATEROLE NOREPLICATION NOBYPASSRLS;
ALTER ROLE kinetwin_app LOGIN NOSUPERUSER NOCREATEDB NOCREATEROLE NOREPLICATION NOBYPASSRLS;
DO $$
BEGIN
  IF pg_has_role('kinetwin_app', 'kinetwin_owner', 'MEMBER') THEN
    REVOKE kinetwin_owner FROM kinetwin_app;
  END IF;
END
$$;

-- This database belongs to the owner (so, from PostgreSQL 15, does its public schema). Only the
-- owner may create in it; the app role may connect, and nobody else may do either.
DO $$
DECLARE
  r record;
BEGIN
  EXECUTE format('ALTER DATABASE %I OWNER TO kinetwin_owner', current_database());
  EXECUTE format('REVOKE ALL ON DATABASE %I FROM PUBLIC', current_database());
  EXECUTE format('GRANT CONNECT ON DATABASE %I TO kinetwin_app', current_database());
  ALTER SCHEMA public OWNER TO kinetwin_owner;
  REVOKE ALL ON SCHEMA public FROM PUBLIC;
  GRANT USAGE ON SCHEMA public TO kinetwin_app;

  -- A database made before these roles existed holds objects of the superuser: hand them over.
  FOR r IN SELECT nspname FROM pg_namespace WHERE nspname = 'drizzle' AND nspowner <> 'kinetwin_owner'::regrole LOOP
    EXECUTE format('ALTER SCHEMA %I OWNER TO kinetwin_owner', r.nspname);
  END LOOP;
  FOR r IN
    SELECT n.nspname, c.relname FROM pg_class c JOIN pg_namespace n ON n.oid = c.relnamespace
    WHERE n.nspname IN ('public', 'drizzle') AND c.relkind IN ('r', 'p', 'v', 'm') AND c.relowner <> 'kinetwin_owner'::regrole
  LOOP
    -- Changing a table's owner changes the owner of its serial sequences and indexes as well.
    EXECUTE format('ALTER TABLE %I.%I OWNER TO kinetwin_owner', r.nspname, r.relname);
  END LOOP;
  FOR r IN
    SELECT n.nspname, c.relname FROM pg_class c JOIN pg_namespace n ON n.oid = c.relnamespace
    WHERE n.nspname IN ('public', 'drizzle') AND c.relkind = 'S' AND c.relowner <> 'kinetwin_owner'::regrole
  LOOP
    EXECUTE format('ALTER SEQUENCE %I.%I OWNER TO kinetwin_owner', r.nspname, r.relname);
  END LOOP;
  FOR r IN
    SELECT n.nspname, t.typname FROM pg_type t JOIN pg_namespace n ON n.oid = t.typnamespace
    WHERE n.nspname = 'public' AND t.typtype = 'e' AND t.typowner <> 'kinetwin_owner'::regrole
  LOOP
    EXECUTE format('ALTER TYPE %I.%I OWNER TO kinetwin_owner', r.nspname, r.typname);
  END LOOP;
  FOR r IN
    SELECT p.oid::regprocedure AS fn FROM pg_proc p JOIN pg_namespace n ON n.oid = p.pronamespace
    WHERE n.nspname = 'public' AND p.proowner <> 'kinetwin_owner'::regrole
  LOOP
    EXECUTE format('ALTER FUNCTION %s OWNER TO kinetwin_owner', r.fn);
  END LOOP;
END
$$;
