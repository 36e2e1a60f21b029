-- Custom migration (npm run db:generate -- --custom): fill vehicles.search_key for the vehicles stored before the
-- column existed, the same way src/lib/vehicles/search-key.ts builds it (upper case, without - space . / _, the
-- registration and fleet number joined by "|"). Later writes keep it up to date.
UPDATE `vehicles` SET `search_key` =
  replace(replace(replace(replace(replace(upper(coalesce(`registration`, '')), '-', ''), ' ', ''), '.', ''), '/', ''), '_', '')
  || '|' ||
  replace(replace(replace(replace(replace(upper(coalesce(`fleet_number`, '')), '-', ''), ' ', ''), '.', ''), '/', ''), '_', '');
