CREATE TABLE `api_tokens` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`team_id` bigint unsigned NOT NULL,
	`user_id` bigint unsigned NOT NULL,
	`name` varchar(80) NOT NULL,
	`token_hash` char(64) NOT NULL,
	`token_hint` varchar(16) NOT NULL,
	`created_at` timestamp(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`last_used_at` timestamp(3),
	`revoked_at` timestamp(3),
	CONSTRAINT `api_tokens_id` PRIMARY KEY(`id`),
	CONSTRAINT `api_tokens_hash_unique` UNIQUE(`token_hash`)
);
--> statement-breakpoint
CREATE TABLE `invites` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`team_id` bigint unsigned NOT NULL,
	`email` varchar(254) NOT NULL,
	`role` enum('admin','engineer','viewer') NOT NULL,
	`token_hash` char(64) NOT NULL,
	`invited_by_user_id` bigint unsigned,
	`created_at` timestamp(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`expires_at` timestamp(3) NOT NULL,
	`accepted_at` timestamp(3),
	`accepted_user_id` bigint unsigned,
	`revoked_at` timestamp(3),
	CONSTRAINT `invites_id` PRIMARY KEY(`id`),
	CONSTRAINT `invites_hash_unique` UNIQUE(`token_hash`)
);
--> statement-breakpoint
CREATE TABLE `memberships` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`team_id` bigint unsigned NOT NULL,
	`user_id` bigint unsigned NOT NULL,
	`role` enum('admin','engineer','viewer') NOT NULL,
	`created_at` timestamp(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` timestamp(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP,
	CONSTRAINT `memberships_id` PRIMARY KEY(`id`),
	CONSTRAINT `memberships_team_user_unique` UNIQUE(`team_id`,`user_id`)
);
--> statement-breakpoint
CREATE TABLE `password_resets` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`user_id` bigint unsigned NOT NULL,
	`token_hash` char(64) NOT NULL,
	`created_at` timestamp(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`expires_at` timestamp(3) NOT NULL,
	`used_at` timestamp(3),
	`requested_ip` varchar(64),
	CONSTRAINT `password_resets_id` PRIMARY KEY(`id`),
	CONSTRAINT `password_resets_hash_unique` UNIQUE(`token_hash`)
);
--> statement-breakpoint
CREATE TABLE `sessions` (
	`session_id` varchar(128) COLLATE utf8mb4_bin NOT NULL,
	`expires` int unsigned NOT NULL,
	`data` mediumtext,
	CONSTRAINT `sessions_session_id` PRIMARY KEY(`session_id`)
);
--> statement-breakpoint
CREATE TABLE `teams` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`name` varchar(120) NOT NULL,
	`quotas` json NOT NULL DEFAULT ('{}'),
	`created_at` timestamp(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` timestamp(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP,
	CONSTRAINT `teams_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `users` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`email` varchar(254) NOT NULL,
	`name` varchar(120) NOT NULL,
	`password_hash` varchar(255) NOT NULL,
	`created_at` timestamp(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` timestamp(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP,
	`disabled_at` timestamp(3),
	CONSTRAINT `users_id` PRIMARY KEY(`id`),
	CONSTRAINT `users_email_unique` UNIQUE(`email`)
);
--> statement-breakpoint
CREATE TABLE `graph_problems` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`team_id` bigint unsigned NOT NULL,
	`graph_id` bigint unsigned NOT NULL,
	`line_number` bigint unsigned NOT NULL,
	`reason` varchar(255) NOT NULL,
	`line` varchar(1024) NOT NULL,
	`created_at` timestamp(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `graph_problems_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `graphs` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`team_id` bigint unsigned NOT NULL,
	`upload_id` bigint unsigned,
	`created_by_user_id` bigint unsigned,
	`name` varchar(200) NOT NULL,
	`options` json NOT NULL,
	`status` enum('queued','ingesting','ready','rejected') NOT NULL DEFAULT 'queued',
	`statistics` json,
	`storage_path` varchar(1024),
	`fingerprint` varchar(128),
	`reject_reason` text,
	`is_demo` boolean NOT NULL DEFAULT false,
	`created_at` timestamp(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` timestamp(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP,
	`ingest_started_at` timestamp(3),
	`finished_at` timestamp(3),
	`deleted_at` timestamp(3),
	CONSTRAINT `graphs_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `uploads` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`team_id` bigint unsigned NOT NULL,
	`user_id` bigint unsigned,
	`tus_id` varchar(128) NOT NULL,
	`filename` varchar(255) NOT NULL,
	`content_type` varchar(127),
	`size` bigint unsigned,
	`offset` bigint unsigned NOT NULL DEFAULT 0,
	`checksum` varchar(128),
	`metadata` json NOT NULL DEFAULT ('{}'),
	`state` enum('uploading','complete','aborted') NOT NULL DEFAULT 'uploading',
	`storage_path` varchar(1024),
	`created_at` timestamp(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` timestamp(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP,
	`completed_at` timestamp(3),
	CONSTRAINT `uploads_id` PRIMARY KEY(`id`),
	CONSTRAINT `uploads_tus_id_unique` UNIQUE(`tus_id`)
);
--> statement-breakpoint
CREATE TABLE `run_events` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`team_id` bigint unsigned NOT NULL,
	`run_id` bigint unsigned NOT NULL,
	`level` enum('info','warn','error') NOT NULL DEFAULT 'info',
	`kind` varchar(64) NOT NULL,
	`message` text NOT NULL,
	`details` json,
	`created_at` timestamp(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `run_events_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `run_iterations` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`team_id` bigint unsigned NOT NULL,
	`run_id` bigint unsigned NOT NULL,
	`k` int unsigned NOT NULL,
	`residual` double NOT NULL,
	`dangling_mass` double,
	`elapsed_ms` double NOT NULL,
	`created_at` timestamp(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `run_iterations_id` PRIMARY KEY(`id`),
	CONSTRAINT `run_iterations_run_k_unique` UNIQUE(`run_id`,`k`)
);
--> statement-breakpoint
CREATE TABLE `run_shards` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`team_id` bigint unsigned NOT NULL,
	`run_id` bigint unsigned NOT NULL,
	`shard` int unsigned NOT NULL,
	`vertex_start` bigint unsigned NOT NULL,
	`vertex_end` bigint unsigned NOT NULL,
	`edge_count` bigint unsigned NOT NULL DEFAULT 0,
	`state` enum('queued','running','done','retrying','failed') NOT NULL DEFAULT 'queued',
	`attempts` int unsigned NOT NULL DEFAULT 0,
	`worker` varchar(128),
	`last_error` text,
	`next_attempt_at` timestamp(3),
	`created_at` timestamp(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` timestamp(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP,
	`started_at` timestamp(3),
	`finished_at` timestamp(3),
	CONSTRAINT `run_shards_id` PRIMARY KEY(`id`),
	CONSTRAINT `run_shards_run_shard_unique` UNIQUE(`run_id`,`shard`)
);
--> statement-breakpoint
CREATE TABLE `runs` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`team_id` bigint unsigned NOT NULL,
	`graph_id` bigint unsigned NOT NULL,
	`created_by_user_id` bigint unsigned,
	`parameters` json NOT NULL,
	`status` enum('queued','running','converged','not-converged','needs-attention','canceled','failed') NOT NULL DEFAULT 'queued',
	`status_reason` text,
	`stop_reason` varchar(64),
	`iterations` int unsigned NOT NULL DEFAULT 0,
	`final_residual` double,
	`error_bound` double,
	`timings` json,
	`outputs` json,
	`input_fingerprint` varchar(128),
	`software_version` varchar(64),
	`notify` boolean NOT NULL DEFAULT false,
	`is_demo` boolean NOT NULL DEFAULT false,
	`claimed_by` varchar(128),
	`heartbeat_at` timestamp(3),
	`cancel_requested_at` timestamp(3),
	`created_at` timestamp(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`updated_at` timestamp(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP,
	`started_at` timestamp(3),
	`finished_at` timestamp(3),
	`deleted_at` timestamp(3),
	CONSTRAINT `runs_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `activity` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`team_id` bigint unsigned,
	`actor_user_id` bigint unsigned,
	`actor_token_id` bigint unsigned,
	`action` varchar(64) NOT NULL,
	`target` varchar(255),
	`details` json,
	`ip` varchar(64),
	`created_at` timestamp(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `activity_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `emails` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`team_id` bigint unsigned,
	`message_id` varchar(255),
	`from_address` varchar(320) NOT NULL,
	`to_address` varchar(1024) NOT NULL,
	`subject` varchar(255) NOT NULL,
	`text_body` mediumtext,
	`html_body` mediumtext,
	`state` enum('captured','sent','failed') NOT NULL,
	`error` text,
	`created_at` timestamp(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `emails_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
ALTER TABLE `api_tokens` ADD CONSTRAINT `api_tokens_team_id_teams_id_fk` FOREIGN KEY (`team_id`) REFERENCES `teams`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `api_tokens` ADD CONSTRAINT `api_tokens_user_id_users_id_fk` FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `invites` ADD CONSTRAINT `invites_team_id_teams_id_fk` FOREIGN KEY (`team_id`) REFERENCES `teams`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `invites` ADD CONSTRAINT `invites_invited_by_user_id_users_id_fk` FOREIGN KEY (`invited_by_user_id`) REFERENCES `users`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `invites` ADD CONSTRAINT `invites_accepted_user_id_users_id_fk` FOREIGN KEY (`accepted_user_id`) REFERENCES `users`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `memberships` ADD CONSTRAINT `memberships_team_id_teams_id_fk` FOREIGN KEY (`team_id`) REFERENCES `teams`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `memberships` ADD CONSTRAINT `memberships_user_id_users_id_fk` FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `password_resets` ADD CONSTRAINT `password_resets_user_id_users_id_fk` FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `graph_problems` ADD CONSTRAINT `graph_problems_team_id_teams_id_fk` FOREIGN KEY (`team_id`) REFERENCES `teams`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `graph_problems` ADD CONSTRAINT `graph_problems_graph_id_graphs_id_fk` FOREIGN KEY (`graph_id`) REFERENCES `graphs`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `graphs` ADD CONSTRAINT `graphs_team_id_teams_id_fk` FOREIGN KEY (`team_id`) REFERENCES `teams`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `graphs` ADD CONSTRAINT `graphs_upload_id_uploads_id_fk` FOREIGN KEY (`upload_id`) REFERENCES `uploads`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `graphs` ADD CONSTRAINT `graphs_created_by_user_id_users_id_fk` FOREIGN KEY (`created_by_user_id`) REFERENCES `users`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `uploads` ADD CONSTRAINT `uploads_team_id_teams_id_fk` FOREIGN KEY (`team_id`) REFERENCES `teams`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `uploads` ADD CONSTRAINT `uploads_user_id_users_id_fk` FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `run_events` ADD CONSTRAINT `run_events_team_id_teams_id_fk` FOREIGN KEY (`team_id`) REFERENCES `teams`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `run_events` ADD CONSTRAINT `run_events_run_id_runs_id_fk` FOREIGN KEY (`run_id`) REFERENCES `runs`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `run_iterations` ADD CONSTRAINT `run_iterations_team_id_teams_id_fk` FOREIGN KEY (`team_id`) REFERENCES `teams`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `run_iterations` ADD CONSTRAINT `run_iterations_run_id_runs_id_fk` FOREIGN KEY (`run_id`) REFERENCES `runs`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `run_shards` ADD CONSTRAINT `run_shards_team_id_teams_id_fk` FOREIGN KEY (`team_id`) REFERENCES `teams`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `run_shards` ADD CONSTRAINT `run_shards_run_id_runs_id_fk` FOREIGN KEY (`run_id`) REFERENCES `runs`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `runs` ADD CONSTRAINT `runs_team_id_teams_id_fk` FOREIGN KEY (`team_id`) REFERENCES `teams`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `runs` ADD CONSTRAINT `runs_graph_id_graphs_id_fk` FOREIGN KEY (`graph_id`) REFERENCES `graphs`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `runs` ADD CONSTRAINT `runs_created_by_user_id_users_id_fk` FOREIGN KEY (`created_by_user_id`) REFERENCES `users`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `activity` ADD CONSTRAINT `activity_team_id_teams_id_fk` FOREIGN KEY (`team_id`) REFERENCES `teams`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `activity` ADD CONSTRAINT `activity_actor_user_id_users_id_fk` FOREIGN KEY (`actor_user_id`) REFERENCES `users`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `activity` ADD CONSTRAINT `activity_actor_token_id_api_tokens_id_fk` FOREIGN KEY (`actor_token_id`) REFERENCES `api_tokens`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `emails` ADD CONSTRAINT `emails_team_id_teams_id_fk` FOREIGN KEY (`team_id`) REFERENCES `teams`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `api_tokens_team_user_idx` ON `api_tokens` (`team_id`,`user_id`);--> statement-breakpoint
CREATE INDEX `invites_team_idx` ON `invites` (`team_id`);--> statement-breakpoint
CREATE INDEX `memberships_user_idx` ON `memberships` (`user_id`);--> statement-breakpoint
CREATE INDEX `password_resets_user_idx` ON `password_resets` (`user_id`);--> statement-breakpoint
CREATE INDEX `graph_problems_graph_idx` ON `graph_problems` (`graph_id`,`line_number`);--> statement-breakpoint
CREATE INDEX `graphs_team_idx` ON `graphs` (`team_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `graphs_status_idx` ON `graphs` (`status`);--> statement-breakpoint
CREATE INDEX `uploads_team_idx` ON `uploads` (`team_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `run_events_run_idx` ON `run_events` (`run_id`,`id`);--> statement-breakpoint
CREATE INDEX `runs_team_idx` ON `runs` (`team_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `runs_status_idx` ON `runs` (`status`,`created_at`);--> statement-breakpoint
CREATE INDEX `runs_graph_idx` ON `runs` (`graph_id`);--> statement-breakpoint
CREATE INDEX `activity_team_idx` ON `activity` (`team_id`,`id`);--> statement-breakpoint
CREATE INDEX `emails_created_idx` ON `emails` (`created_at`);