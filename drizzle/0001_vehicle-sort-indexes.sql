CREATE INDEX `vehicles_build_date_idx` ON `vehicles` (`build_date`);--> statement-breakpoint
CREATE INDEX `vehicles_in_service_idx` ON `vehicles` (`in_service_date`);--> statement-breakpoint
CREATE INDEX `vehicles_make_model_idx` ON `vehicles` (`make`,`model`);