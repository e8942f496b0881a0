/**
 * Hours without an actual interval after which a meter counts as sending
 * no data: a missed day. The default of each person's alert setting
 * (`alert_settings.silent_hours`), the Overview's list and the reports'
 * data-quality count. Plain module.
 */
export const NO_DATA_AFTER_HOURS = 24;
