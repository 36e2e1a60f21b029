// GET /api/settings: the settings in force (any signed-in person: lists and pages explain the repeat window),
// with the recent changes for admins. PATCH /api/settings (admins): change them; `?dryRun=1` previews.
import { handle, json, readJson, readQuery, methodNotAllowed } from '@/server/http';
import { requirePermission, actorOf } from '@/server/auth';
import { can } from '@/lib/auth/permissions';
import { SettingsPatchQuery, SettingsPatchSchema } from '@/lib/contracts/settings';
import { getSettings, listSettingsChanges, updateSettings } from '@/server/settings';

export const GET = handle((ctx) => {
  const user = requirePermission(ctx, 'read');
  return json({ ...getSettings(), ...(can(user.role, 'settings:write') ? { changes: listSettingsChanges() } : {}) });
});

export const PATCH = handle(async (ctx) => {
  const user = requirePermission(ctx, 'settings:write');
  const { dryRun } = readQuery(ctx, SettingsPatchQuery);
  const patch = await readJson(ctx, SettingsPatchSchema);
  return json(updateSettings(patch, actorOf(user), { dryRun: dryRun === '1' || dryRun === 'true' }));
});

export const ALL = methodNotAllowed('GET, PATCH');
