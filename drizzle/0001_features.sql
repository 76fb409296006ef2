CREATE TABLE `api_tokens` (
	`id` text PRIMARY KEY NOT NULL,
	`user_id` text NOT NULL,
	`name` text NOT NULL,
	`token_hash` text NOT NULL,
	`prefix` text NOT NULL,
	`scope` text NOT NULL,
	`last_used_at` integer,
	`revoked_at` integer,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `api_tokens_token_hash_unique` ON `api_tokens` (`token_hash`);--> statement-breakpoint
CREATE INDEX `api_tokens_user_idx` ON `api_tokens` (`user_id`);--> statement-breakpoint
CREATE TABLE `classroom_sessions` (
	`id` text PRIMARY KEY NOT NULL,
	`classroom_id` text NOT NULL,
	`title` text NOT NULL,
	`day` text NOT NULL,
	`opens_at` integer NOT NULL,
	`closes_at` integer NOT NULL,
	`instrument_name` text NOT NULL,
	`instrument_kind` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`classroom_id`) REFERENCES `classrooms`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `classroom_sessions_classroom_idx` ON `classroom_sessions` (`classroom_id`,`day`);--> statement-breakpoint
CREATE TABLE `import_batches` (
	`id` text PRIMARY KEY NOT NULL,
	`observer_id` text NOT NULL,
	`by_user_id` text,
	`file_name` text NOT NULL,
	`file_hash` text NOT NULL,
	`rows_imported` integer NOT NULL,
	`rows_skipped` integer NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`observer_id`) REFERENCES `observers`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE TABLE `jobs` (
	`id` text PRIMARY KEY NOT NULL,
	`kind` text NOT NULL,
	`status` text DEFAULT 'queued' NOT NULL,
	`progress` real DEFAULT 0 NOT NULL,
	`message` text,
	`params` text DEFAULT '{}' NOT NULL,
	`requested_by_user_id` text,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`started_at` integer,
	`finished_at` integer,
	FOREIGN KEY (`requested_by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `jobs_kind_created_idx` ON `jobs` (`kind`,`created_at`);--> statement-breakpoint
CREATE TABLE `notifications` (
	`id` text PRIMARY KEY NOT NULL,
	`user_id` text NOT NULL,
	`kind` text NOT NULL,
	`message` text NOT NULL,
	`link` text,
	`read_at` integer,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `notifications_user_idx` ON `notifications` (`user_id`,`created_at`);--> statement-breakpoint
CREATE TABLE `observation_flags` (
	`id` text PRIMARY KEY NOT NULL,
	`observation_id` text NOT NULL,
	`reason` text NOT NULL,
	`detail` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`observation_id`) REFERENCES `observations`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `observation_flags_observation_idx` ON `observation_flags` (`observation_id`);--> statement-breakpoint
CREATE INDEX `observation_flags_reason_idx` ON `observation_flags` (`reason`);--> statement-breakpoint
CREATE TABLE `observation_groups` (
	`id` text PRIMARY KEY NOT NULL,
	`observation_id` text NOT NULL,
	`number` integer NOT NULL,
	`spots` integer NOT NULL,
	`zurich_class` text,
	`mcintosh_class` text,
	`latitude_deg` real NOT NULL,
	`cmd_deg` real NOT NULL,
	`carrington_lon_deg` real NOT NULL,
	`hemisphere` text NOT NULL,
	`area_msh` real,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`observation_id`) REFERENCES `observations`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `observation_groups_observation_idx` ON `observation_groups` (`observation_id`);--> statement-breakpoint
CREATE TABLE `photos` (
	`id` text PRIMARY KEY NOT NULL,
	`file_key` text NOT NULL,
	`observer_id` text NOT NULL,
	`observation_id` text,
	`name` text NOT NULL,
	`size_bytes` integer NOT NULL,
	`mime_type` text NOT NULL,
	`width_px` integer,
	`height_px` integer,
	`url` text NOT NULL,
	`thumbnail_key` text,
	`exif_taken_at` integer,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`observer_id`) REFERENCES `observers`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`observation_id`) REFERENCES `observations`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `photos_file_key_unique` ON `photos` (`file_key`);--> statement-breakpoint
CREATE INDEX `photos_observer_idx` ON `photos` (`observer_id`);--> statement-breakpoint
CREATE INDEX `photos_observation_idx` ON `photos` (`observation_id`);--> statement-breakpoint
CREATE TABLE `rate_limits` (
	`key` text PRIMARY KEY NOT NULL,
	`window_started_at` integer NOT NULL,
	`count` integer NOT NULL
);
--> statement-breakpoint
CREATE TABLE `reference_series` (
	`id` text PRIMARY KEY NOT NULL,
	`name` text NOT NULL,
	`licence` text NOT NULL,
	`source` text,
	`imported_by_user_id` text,
	`first_day` text NOT NULL,
	`last_day` text NOT NULL,
	`days` integer NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`imported_by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE TABLE `reference_values` (
	`series_id` text NOT NULL,
	`day` text NOT NULL,
	`value` real NOT NULL,
	PRIMARY KEY(`series_id`, `day`),
	FOREIGN KEY (`series_id`) REFERENCES `reference_series`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `review_decisions` (
	`id` text PRIMARY KEY NOT NULL,
	`observation_id` text NOT NULL,
	`actor_user_id` text NOT NULL,
	`action` text NOT NULL,
	`from_status` text NOT NULL,
	`to_status` text NOT NULL,
	`note` text,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`observation_id`) REFERENCES `observations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`actor_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `review_decisions_observation_idx` ON `review_decisions` (`observation_id`,`created_at`);--> statement-breakpoint
CREATE TABLE `series_daily` (
	`day` text NOT NULL,
	`hemisphere` text NOT NULL,
	`observers` integer NOT NULL,
	`sum` real NOT NULL,
	`sum_squares` real NOT NULL,
	`mean` real NOT NULL,
	`sd` real,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	PRIMARY KEY(`hemisphere`, `day`)
);
--> statement-breakpoint
CREATE TABLE `series_monthly` (
	`month` text NOT NULL,
	`hemisphere` text NOT NULL,
	`days` integer NOT NULL,
	`sum_of_daily_means` real NOT NULL,
	`mean` real NOT NULL,
	`smoothed` real,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	PRIMARY KEY(`hemisphere`, `month`)
);
--> statement-breakpoint
CREATE TABLE `series_yearly` (
	`year` integer NOT NULL,
	`hemisphere` text NOT NULL,
	`days` integer NOT NULL,
	`mean` real NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	PRIMARY KEY(`hemisphere`, `year`)
);
--> statement-breakpoint
CREATE TABLE `settings` (
	`key` text PRIMARY KEY NOT NULL,
	`value` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL
);
--> statement-breakpoint
CREATE TABLE `tracings` (
	`id` text PRIMARY KEY NOT NULL,
	`observation_id` text NOT NULL,
	`observer_id` text NOT NULL,
	`format_version` integer NOT NULL,
	`revision` integer DEFAULT 1 NOT NULL,
	`vector` text NOT NULL,
	`png` blob,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`updated_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`observation_id`) REFERENCES `observations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`observer_id`) REFERENCES `observers`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `tracings_observation_id_unique` ON `tracings` (`observation_id`);--> statement-breakpoint
ALTER TABLE `k_coefficients` ADD `period_kind` text DEFAULT 'year' NOT NULL;--> statement-breakpoint
ALTER TABLE `observations` ADD `class_session_id` text;--> statement-breakpoint
ALTER TABLE `observations` ADD `import_key` text;--> statement-breakpoint
ALTER TABLE `observations` ADD `import_batch_id` text;--> statement-breakpoint
CREATE UNIQUE INDEX `observations_class_session_idx` ON `observations` (`observer_id`,`class_session_id`);--> statement-breakpoint
CREATE UNIQUE INDEX `observations_import_key_idx` ON `observations` (`observer_id`,`import_key`);