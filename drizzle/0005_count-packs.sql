CREATE TABLE `count_pack_changes` (
	`seq` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`instrument_id` text NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `count_pack_changes_instrument_idx` ON `count_pack_changes` (`instrument_id`);--> statement-breakpoint
CREATE TABLE `count_packs` (
	`instrument_id` text PRIMARY KEY NOT NULL,
	`format` integer NOT NULL,
	`count` integer NOT NULL,
	`packed` blob NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL
);--> statement-breakpoint
-- Every change to an accepted count marks its instrument's pack as out of
-- date (db/schema.ts, count_pack_changes). Delete then insert, rather than
-- an upsert, so the change always takes a new seq and no conflict policy of
-- the statement that fired the trigger can turn it into a no-op.
CREATE TRIGGER `count_pack_on_insert` AFTER INSERT ON `observations`
WHEN NEW.status = 'accepted'
BEGIN
  DELETE FROM count_pack_changes WHERE instrument_id = NEW.instrument_id;
  INSERT INTO count_pack_changes (instrument_id) VALUES (NEW.instrument_id);
END;--> statement-breakpoint
CREATE TRIGGER `count_pack_on_delete` AFTER DELETE ON `observations`
WHEN OLD.status = 'accepted'
BEGIN
  DELETE FROM count_pack_changes WHERE instrument_id = OLD.instrument_id;
  INSERT INTO count_pack_changes (instrument_id) VALUES (OLD.instrument_id);
END;--> statement-breakpoint
CREATE TRIGGER `count_pack_on_update` AFTER UPDATE OF status, instrument_id, ut_date, groups, spots, north_groups, north_spots, south_groups, south_spots ON `observations`
WHEN (OLD.status = 'accepted' OR NEW.status = 'accepted')
  AND (OLD.status IS NOT NEW.status OR OLD.instrument_id IS NOT NEW.instrument_id OR OLD.ut_date IS NOT NEW.ut_date OR OLD.groups IS NOT NEW.groups OR OLD.spots IS NOT NEW.spots OR OLD.north_groups IS NOT NEW.north_groups OR OLD.north_spots IS NOT NEW.north_spots OR OLD.south_groups IS NOT NEW.south_groups OR OLD.south_spots IS NOT NEW.south_spots)
BEGIN
  DELETE FROM count_pack_changes WHERE instrument_id = OLD.instrument_id;
  INSERT INTO count_pack_changes (instrument_id) VALUES (OLD.instrument_id);
  DELETE FROM count_pack_changes WHERE instrument_id = NEW.instrument_id;
  INSERT INTO count_pack_changes (instrument_id) VALUES (NEW.instrument_id);
END;
