import type { QueryInterface } from 'sequelize'

/**
 * Response targets and business hours (one row), satisfaction ratings, and `rw_working_seconds`:
 * the SQL twin of server/services/business-hours.ts `workingMs` (same method, documented there),
 * so percentiles of working time are computed in the database.
 */
export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.sequelize.query(`
    CREATE TABLE desk_settings (
      id smallint PRIMARY KEY DEFAULT 1 CHECK (id = 1),
      first_response_hours double precision NOT NULL DEFAULT 24,
      resolution_hours double precision NOT NULL DEFAULT 120,
      warn_at_percent integer NOT NULL DEFAULT 75,
      time_zone varchar(64),
      week jsonb,
      updated_at timestamptz,
      updated_by uuid REFERENCES users(id) ON DELETE SET NULL
    );
    INSERT INTO desk_settings (id) VALUES (1);

    CREATE TABLE case_ratings (
      case_id uuid PRIMARY KEY REFERENCES cases(id) ON DELETE CASCADE,
      listener_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
      score smallint NOT NULL CHECK (score BETWEEN 1 AND 5),
      comment text NOT NULL DEFAULT '',
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX case_ratings_time ON case_ratings (created_at);

    CREATE INDEX case_events_moves ON case_events (case_id, created_at) WHERE to_status IS NOT NULL;
    CREATE INDEX cases_closed_at ON cases (closed_at) WHERE closed_at IS NOT NULL;

    -- Working seconds between two instants: for each local date the interval touches, the overlap
    -- with that weekday's hours (week: 7 entries, Monday first, each null or {"start":"HH:MM","end":"HH:MM"}).
    CREATE FUNCTION rw_working_seconds(a timestamptz, b timestamptz, tz text, week jsonb) RETURNS double precision
    LANGUAGE sql STABLE PARALLEL SAFE AS $$
      SELECT CASE WHEN a IS NULL OR b IS NULL THEN NULL
                  WHEN week IS NULL OR tz IS NULL THEN GREATEST(0, EXTRACT(EPOCH FROM b - a)::double precision)
                  WHEN b <= a THEN 0
                  ELSE COALESCE((
        SELECT SUM(GREATEST(0, EXTRACT(EPOCH FROM
                 LEAST(b, (g.d + (w.h->>'end')::interval) AT TIME ZONE tz)
               - GREATEST(a, (g.d + (w.h->>'start')::interval) AT TIME ZONE tz))::double precision))
          FROM generate_series((a AT TIME ZONE tz)::date::timestamp, (b AT TIME ZONE tz)::date::timestamp, interval '1 day') AS g(d)
          CROSS JOIN LATERAL (SELECT week -> (EXTRACT(ISODOW FROM g.d)::int - 1) AS h) w
         WHERE jsonb_typeof(w.h) = 'object'), 0) END
    $$;
  `)
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.sequelize.query(`
    DROP FUNCTION rw_working_seconds(timestamptz, timestamptz, text, jsonb);
    DROP INDEX cases_closed_at; DROP INDEX case_events_moves;
    DROP TABLE case_ratings; DROP TABLE desk_settings;
  `)
}
