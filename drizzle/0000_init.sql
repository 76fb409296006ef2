CREATE TABLE `accounts` (
	`user_id` text NOT NULL,
	`type` text NOT NULL,
	`provider` text NOT NULL,
	`provider_account_id` text NOT NULL,
	`refresh_token` text,
	`access_token` text,
	`expires_at` integer,
	`token_type` text,
	`scope` text,
	`id_token` text,
	`session_state` text,
	PRIMARY KEY(`provider`, `provider_account_id`),
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `captured_mail` (
	`id` text PRIMARY KEY NOT NULL,
	`from_address` text NOT NULL,
	`to_address` text NOT NULL,
	`subject` text NOT NULL,
	`text_body` text,
	`html_body` text,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL
);
--> statement-breakpoint
CREATE TABLE `classroom_members` (
	`classroom_id` text NOT NULL,
	`user_id` text NOT NULL,
	`pin_hash` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	PRIMARY KEY(`classroom_id`, `user_id`),
	FOREIGN KEY (`classroom_id`) REFERENCES `classrooms`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `classroom_members_user_idx` ON `classroom_members` (`user_id`);--> statement-breakpoint
CREATE TABLE `classrooms` (
	`id` text PRIMARY KEY NOT NULL,
	`educator_user_id` text NOT NULL,
	`name` text NOT NULL,
	`school` text NOT NULL,
	`term_start` text NOT NULL,
	`term_end` text NOT NULL,
	`join_code` text NOT NULL,
	`join_open` integer DEFAULT false NOT NULL,
	`capacity` integer DEFAULT 40 NOT NULL,
	`compare_with_others` integer DEFAULT false NOT NULL,
	`archived_at` integer,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`educator_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `classrooms_join_code_unique` ON `classrooms` (`join_code`);--> statement-breakpoint
CREATE TABLE `idempotency_keys` (
	`user_id` text NOT NULL,
	`key` text NOT NULL,
	`scope` text NOT NULL,
	`request_hash` text NOT NULL,
	`response_status` integer NOT NULL,
	`response_body` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	PRIMARY KEY(`user_id`, `scope`, `key`),
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `instruments` (
	`id` text PRIMARY KEY NOT NULL,
	`observer_id` text NOT NULL,
	`name` text NOT NULL,
	`kind` text NOT NULL,
	`params` text DEFAULT '{}' NOT NULL,
	`notes` text,
	`archived_at` integer,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`observer_id`) REFERENCES `observers`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `instruments_observer_idx` ON `instruments` (`observer_id`);--> statement-breakpoint
CREATE TABLE `k_coefficients` (
	`id` text PRIMARY KEY NOT NULL,
	`observer_id` text NOT NULL,
	`instrument_id` text,
	`period_start` text NOT NULL,
	`period_end` text NOT NULL,
	`k` real NOT NULL,
	`sigma` real,
	`common_days` integer NOT NULL,
	`method` text NOT NULL,
	`reference` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`observer_id`) REFERENCES `observers`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`instrument_id`) REFERENCES `instruments`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `k_observer_period_idx` ON `k_coefficients` (`observer_id`,`period_end`);--> statement-breakpoint
CREATE TABLE `observations` (
	`id` text PRIMARY KEY NOT NULL,
	`observer_id` text NOT NULL,
	`instrument_id` text NOT NULL,
	`observed_at` integer NOT NULL,
	`ut_date` text NOT NULL,
	`seeing` integer NOT NULL,
	`groups` integer NOT NULL,
	`spots` integer NOT NULL,
	`north_groups` integer,
	`north_spots` integer,
	`south_groups` integer,
	`south_spots` integer,
	`notes` text,
	`status` text DEFAULT 'submitted' NOT NULL,
	`source` text DEFAULT 'form' NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`updated_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`observer_id`) REFERENCES `observers`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`instrument_id`) REFERENCES `instruments`(`id`) ON UPDATE no action ON DELETE restrict
);
--> statement-breakpoint
CREATE INDEX `observations_observer_date_idx` ON `observations` (`observer_id`,`ut_date`);--> statement-breakpoint
CREATE INDEX `observations_date_idx` ON `observations` (`ut_date`);--> statement-breakpoint
CREATE INDEX `observations_status_created_idx` ON `observations` (`status`,`created_at`);--> statement-breakpoint
CREATE INDEX `observations_created_idx` ON `observations` (`created_at`);--> statement-breakpoint
CREATE TABLE `observers` (
	`id` text PRIMARY KEY NOT NULL,
	`user_id` text NOT NULL,
	`display_name` text NOT NULL,
	`code` text NOT NULL,
	`country` text,
	`time_zone` text DEFAULT 'UTC' NOT NULL,
	`unit_system` text DEFAULT 'metric' NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `observers_user_id_unique` ON `observers` (`user_id`);--> statement-breakpoint
CREATE UNIQUE INDEX `observers_code_unique` ON `observers` (`code`);--> statement-breakpoint
CREATE INDEX `observers_display_name_idx` ON `observers` (`display_name`);--> statement-breakpoint
CREATE TABLE `password_reset_tokens` (
	`token_hash` text PRIMARY KEY NOT NULL,
	`user_id` text NOT NULL,
	`expires_at` integer NOT NULL,
	`used_at` integer,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `sessions` (
	`session_token` text PRIMARY KEY NOT NULL,
	`user_id` text NOT NULL,
	`expires` integer NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `sign_in_throttle` (
	`key` text PRIMARY KEY NOT NULL,
	`failures` integer DEFAULT 0 NOT NULL,
	`window_started_at` integer NOT NULL,
	`locked_until` integer
);
--> statement-breakpoint
CREATE TABLE `users` (
	`id` text PRIMARY KEY NOT NULL,
	`name` text,
	`email` text,
	`email_verified` integer,
	`image` text,
	`role` text DEFAULT 'observer' NOT NULL,
	`password_hash` text,
	`is_demo` integer DEFAULT false NOT NULL,
	`disabled_at` integer,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `users_email_unique` ON `users` (`email`);--> statement-breakpoint
CREATE TABLE `verification_tokens` (
	`identifier` text NOT NULL,
	`token` text NOT NULL,
	`expires` integer NOT NULL,
	PRIMARY KEY(`identifier`, `token`)
);
