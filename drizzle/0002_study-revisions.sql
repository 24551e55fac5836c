-- Per-study data revision (server/db/schema.ts studyRevisions): every insert, update and delete of a
-- study's data bumps its row, whatever code made the write, so caches keyed by (study, revision)
-- cannot serve stale data. Triggers rather than application code: there are many write paths
-- (routes, imports, bulk results, calculators, CLI, restore) and a missed one would be silent.
-- Existing studies start at revision 1.
INSERT INTO `study_revisions` (`study_id`, `revision`) SELECT `id`, 1 FROM `studies` WHERE true
ON CONFLICT (`study_id`) DO NOTHING;
--> statement-breakpoint
CREATE TRIGGER `studies_rev_insert` AFTER INSERT ON `studies` BEGIN
  INSERT INTO `study_revisions` (`study_id`, `revision`) VALUES (NEW.`id`, 1)
  ON CONFLICT (`study_id`) DO UPDATE SET `revision` = `revision` + 1;
END;
--> statement-breakpoint
CREATE TRIGGER `studies_rev_update` AFTER UPDATE ON `studies` BEGIN
  UPDATE `study_revisions` SET `revision` = `revision` + 1 WHERE `study_id` IN (OLD.`id`, NEW.`id`);
END;
--> statement-breakpoint
CREATE TRIGGER `studies_rev_delete` AFTER DELETE ON `studies` BEGIN
  UPDATE `study_revisions` SET `revision` = `revision` + 1 WHERE `study_id` = OLD.`id`;
END;
--> statement-breakpoint
CREATE TRIGGER `factors_rev_insert` AFTER INSERT ON `factors` BEGIN
  UPDATE `study_revisions` SET `revision` = `revision` + 1 WHERE `study_id` = NEW.`study_id`;
END;
--> statement-breakpoint
CREATE TRIGGER `factors_rev_update` AFTER UPDATE ON `factors` BEGIN
  UPDATE `study_revisions` SET `revision` = `revision` + 1 WHERE `study_id` IN (OLD.`study_id`, NEW.`study_id`);
END;
--> statement-breakpoint
CREATE TRIGGER `factors_rev_delete` AFTER DELETE ON `factors` BEGIN
  UPDATE `study_revisions` SET `revision` = `revision` + 1 WHERE `study_id` = OLD.`study_id`;
END;
--> statement-breakpoint
CREATE TRIGGER `responses_rev_insert` AFTER INSERT ON `responses` BEGIN
  UPDATE `study_revisions` SET `revision` = `revision` + 1 WHERE `study_id` = NEW.`study_id`;
END;
--> statement-breakpoint
CREATE TRIGGER `responses_rev_update` AFTER UPDATE ON `responses` BEGIN
  UPDATE `study_revisions` SET `revision` = `revision` + 1 WHERE `study_id` IN (OLD.`study_id`, NEW.`study_id`);
END;
--> statement-breakpoint
CREATE TRIGGER `responses_rev_delete` AFTER DELETE ON `responses` BEGIN
  UPDATE `study_revisions` SET `revision` = `revision` + 1 WHERE `study_id` = OLD.`study_id`;
END;
--> statement-breakpoint
CREATE TRIGGER `outcomes_rev_insert` AFTER INSERT ON `outcomes` BEGIN
  UPDATE `study_revisions` SET `revision` = `revision` + 1 WHERE `study_id` = NEW.`study_id`;
END;
--> statement-breakpoint
CREATE TRIGGER `outcomes_rev_update` AFTER UPDATE ON `outcomes` BEGIN
  UPDATE `study_revisions` SET `revision` = `revision` + 1 WHERE `study_id` IN (OLD.`study_id`, NEW.`study_id`);
END;
--> statement-breakpoint
CREATE TRIGGER `outcomes_rev_delete` AFTER DELETE ON `outcomes` BEGIN
  UPDATE `study_revisions` SET `revision` = `revision` + 1 WHERE `study_id` = OLD.`study_id`;
END;
--> statement-breakpoint
CREATE TRIGGER `plans_rev_insert` AFTER INSERT ON `plans` BEGIN
  UPDATE `study_revisions` SET `revision` = `revision` + 1 WHERE `study_id` = NEW.`study_id`;
END;
--> statement-breakpoint
CREATE TRIGGER `plans_rev_update` AFTER UPDATE ON `plans` BEGIN
  UPDATE `study_revisions` SET `revision` = `revision` + 1 WHERE `study_id` IN (OLD.`study_id`, NEW.`study_id`);
END;
--> statement-breakpoint
CREATE TRIGGER `plans_rev_delete` AFTER DELETE ON `plans` BEGIN
  UPDATE `study_revisions` SET `revision` = `revision` + 1 WHERE `study_id` = OLD.`study_id`;
END;
--> statement-breakpoint
CREATE TRIGGER `runs_rev_insert` AFTER INSERT ON `runs` BEGIN
  UPDATE `study_revisions` SET `revision` = `revision` + 1 WHERE `study_id` = NEW.`study_id`;
END;
--> statement-breakpoint
CREATE TRIGGER `runs_rev_update` AFTER UPDATE ON `runs` BEGIN
  UPDATE `study_revisions` SET `revision` = `revision` + 1 WHERE `study_id` IN (OLD.`study_id`, NEW.`study_id`);
END;
--> statement-breakpoint
CREATE TRIGGER `runs_rev_delete` AFTER DELETE ON `runs` BEGIN
  UPDATE `study_revisions` SET `revision` = `revision` + 1 WHERE `study_id` = OLD.`study_id`;
END;
--> statement-breakpoint
CREATE TRIGGER `attachments_rev_insert` AFTER INSERT ON `attachments` BEGIN
  UPDATE `study_revisions` SET `revision` = `revision` + 1 WHERE `study_id` = NEW.`study_id`;
END;
--> statement-breakpoint
CREATE TRIGGER `attachments_rev_update` AFTER UPDATE ON `attachments` BEGIN
  UPDATE `study_revisions` SET `revision` = `revision` + 1 WHERE `study_id` IN (OLD.`study_id`, NEW.`study_id`);
END;
--> statement-breakpoint
CREATE TRIGGER `attachments_rev_delete` AFTER DELETE ON `attachments` BEGIN
  UPDATE `study_revisions` SET `revision` = `revision` + 1 WHERE `study_id` = OLD.`study_id`;
END;
--> statement-breakpoint
CREATE TRIGGER `run_values_rev_insert` AFTER INSERT ON `run_values` BEGIN
  UPDATE `study_revisions` SET `revision` = `revision` + 1 WHERE `study_id` = (SELECT `study_id` FROM `runs` WHERE `id` = NEW.`run_id`);
END;
--> statement-breakpoint
CREATE TRIGGER `run_values_rev_update` AFTER UPDATE ON `run_values` BEGIN
  UPDATE `study_revisions` SET `revision` = `revision` + 1 WHERE `study_id` IN (SELECT `study_id` FROM `runs` WHERE `id` IN (OLD.`run_id`, NEW.`run_id`));
END;
--> statement-breakpoint
CREATE TRIGGER `run_values_rev_delete` AFTER DELETE ON `run_values` BEGIN
  UPDATE `study_revisions` SET `revision` = `revision` + 1 WHERE `study_id` = (SELECT `study_id` FROM `runs` WHERE `id` = OLD.`run_id`);
END;
--> statement-breakpoint
CREATE TRIGGER `run_measurements_rev_insert` AFTER INSERT ON `run_measurements` BEGIN
  UPDATE `study_revisions` SET `revision` = `revision` + 1 WHERE `study_id` = (SELECT `study_id` FROM `runs` WHERE `id` = NEW.`run_id`);
END;
--> statement-breakpoint
CREATE TRIGGER `run_measurements_rev_update` AFTER UPDATE ON `run_measurements` BEGIN
  UPDATE `study_revisions` SET `revision` = `revision` + 1 WHERE `study_id` IN (SELECT `study_id` FROM `runs` WHERE `id` IN (OLD.`run_id`, NEW.`run_id`));
END;
--> statement-breakpoint
CREATE TRIGGER `run_measurements_rev_delete` AFTER DELETE ON `run_measurements` BEGIN
  UPDATE `study_revisions` SET `revision` = `revision` + 1 WHERE `study_id` = (SELECT `study_id` FROM `runs` WHERE `id` = OLD.`run_id`);
END;
