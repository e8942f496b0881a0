-- On the partitioned parent, so PostgreSQL builds it on every month's partition
-- and on each one created later. Edited intervals are few: a report's data
-- quality looks them up per month instead of reading the month's intervals.
CREATE INDEX "intervals_edited_idx" ON "intervals" USING btree ("organization_id","meter_id","interval_start") WHERE quality = 'edited';
