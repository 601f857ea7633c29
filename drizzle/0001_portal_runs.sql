CREATE TABLE `run_top` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`team_id` bigint unsigned NOT NULL,
	`run_id` bigint unsigned NOT NULL,
	`rank` int unsigned NOT NULL,
	`node_id` varchar(1024) NOT NULL,
	`score` double NOT NULL,
	CONSTRAINT `run_top_id` PRIMARY KEY(`id`),
	CONSTRAINT `run_top_run_rank_unique` UNIQUE(`run_id`,`rank`)
);
--> statement-breakpoint
CREATE TABLE `runner_heartbeats` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`runner_id` varchar(128) NOT NULL,
	`host` varchar(255) NOT NULL,
	`pid` int unsigned NOT NULL,
	`threads` int unsigned NOT NULL,
	`busy` int unsigned NOT NULL DEFAULT 0,
	`rss_bytes` bigint unsigned NOT NULL DEFAULT 0,
	`heap_bytes` bigint unsigned NOT NULL DEFAULT 0,
	`current_run_id` bigint unsigned,
	`current_graph_id` bigint unsigned,
	`software_version` varchar(64),
	`started_at` timestamp(3) NOT NULL,
	`beat_at` timestamp(3) NOT NULL,
	`stopped_at` timestamp(3),
	CONSTRAINT `runner_heartbeats_id` PRIMARY KEY(`id`),
	CONSTRAINT `runner_heartbeats_runner_unique` UNIQUE(`runner_id`)
);
--> statement-breakpoint
ALTER TABLE `users` ADD `notify` boolean DEFAULT true NOT NULL;--> statement-breakpoint
ALTER TABLE `graph_problems` ADD `detail` varchar(255) DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE `graphs` ADD `rejection` json;--> statement-breakpoint
ALTER TABLE `graphs` ADD `progress` json;--> statement-breakpoint
ALTER TABLE `graphs` ADD `claimed_by` varchar(128);--> statement-breakpoint
ALTER TABLE `graphs` ADD `heartbeat_at` timestamp(3);--> statement-breakpoint
ALTER TABLE `runs` ADD `retry_requested_at` timestamp(3);--> statement-breakpoint
ALTER TABLE `runs` ADD `attempts` int unsigned DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE `runs` ADD `last_checkpoint_k` int unsigned;--> statement-breakpoint
ALTER TABLE `run_top` ADD CONSTRAINT `run_top_team_id_teams_id_fk` FOREIGN KEY (`team_id`) REFERENCES `teams`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `run_top` ADD CONSTRAINT `run_top_run_id_runs_id_fk` FOREIGN KEY (`run_id`) REFERENCES `runs`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `runner_heartbeats_beat_idx` ON `runner_heartbeats` (`beat_at`);