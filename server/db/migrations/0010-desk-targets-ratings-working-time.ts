import { DataTypes, Op, literal, type QueryInterface } from 'sequelize'
import { maybeAt, optional, ref, required, stamp } from '../columns'

/**
 * Response targets and business hours (one row), satisfaction ratings, and `rw_working_seconds`:
 * the SQL twin of server/services/business-hours.ts `workingMs` (same method, documented there),
 * so percentiles of working time are computed in the database.
 */
export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  // literal: QueryInterface would quote a number default of a DOUBLE column as a string ('24'::double precision).
  await q.createTable('desk_settings', {
    id: { type: DataTypes.SMALLINT, primaryKey: true, allowNull: false, defaultValue: 1 },
    first_response_hours: required(DataTypes.DOUBLE, literal('24')),
    resolution_hours: required(DataTypes.DOUBLE, literal('120')),
    warn_at_percent: required(DataTypes.INTEGER, 75),
    time_zone: optional(DataTypes.STRING(64)),
    week: optional(DataTypes.JSONB),
    updated_at: maybeAt(),
    updated_by: ref('users', 'SET NULL'),
  })
  await q.addConstraint('desk_settings', { type: 'check', name: 'desk_settings_id_check', fields: ['id'], where: { id: 1 } })
  await q.bulkInsert('desk_settings', [{ id: 1 }])

  await q.createTable('case_ratings', {
    case_id: { ...ref('cases', 'CASCADE', true), primaryKey: true },
    listener_id: ref('users', 'CASCADE', true),
    score: required(DataTypes.SMALLINT),
    comment: required(DataTypes.TEXT, ''),
    created_at: stamp(),
  })
  await q.addConstraint('case_ratings', { type: 'check', name: 'case_ratings_score_check', fields: ['score'], where: { score: { [Op.between]: [1, 5] } } })
  await q.addIndex('case_ratings', { fields: ['created_at'], name: 'case_ratings_time' })

  await q.addIndex('case_events', { fields: ['case_id', 'created_at'], name: 'case_events_moves', where: { to_status: { [Op.ne]: null } } })
  await q.addIndex('cases', { fields: ['closed_at'], name: 'cases_closed_at', where: { closed_at: { [Op.ne]: null } } })

  // Raw SQL: QueryInterface cannot create a function. Working seconds between two instants: for each local
  // date the interval touches, the overlap with that weekday's hours (week: 7 entries, Monday first, each
  // null or {"start":"HH:MM","end":"HH:MM"}).
  await q.sequelize.query(`
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
  // Raw SQL: the function (see up).
  await q.sequelize.query('DROP FUNCTION rw_working_seconds(timestamptz, timestamptz, text, jsonb)')
  await q.removeIndex('cases', 'cases_closed_at')
  await q.removeIndex('case_events', 'case_events_moves')
  await q.dropTable('case_ratings')
  await q.dropTable('desk_settings')
}
