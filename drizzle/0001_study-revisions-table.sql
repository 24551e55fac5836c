CREATE TABLE `study_revisions` (
	`study_id` integer PRIMARY KEY NOT NULL,
	`revision` integer DEFAULT 1 NOT NULL
);
