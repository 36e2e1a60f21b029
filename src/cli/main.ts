/**
 * Seepline command line (`npm run cli -- <command> [options]`), on the database named by DATABASE_URL.
 * Exit 0 on success, 1 on a handled error (one line on stderr), 2 on bad usage. Edit to add a command;
 * keep CONTRACT.md's command names and options.
 */
import { parseArgs, type ParseArgsConfig } from 'node:util';
import fs from 'node:fs';
import path from 'node:path';
import { ZodError } from 'zod';

class UsageError extends Error {}
class HandledError extends Error {}

const USAGE = `Usage: npm run cli -- <command> [options]

Commands:
  migrate                                   apply pending database migrations
  seed-demo                                 load the demo scenario into an empty database
  user-add --email E --name N --role R --password P [--depots C1,C2]
                                            create a person (roles: admin, manager, supervisor, technician, viewer)
  token-create --email E [--label L]        print a new API token for that person (last line of stdout)
  import <depots|modules|vehicles|defects> FILE [--dry-run] [--json]
                                            import a CSV file (all rows or none)
  patterns [--as-of YYYY-MM-DD] [--json]     print the patterns report (same JSON as GET /api/patterns)
  trace FILE [--pulses-per-rev N] [--supply-v V] --json
                                            analyse a hall-sensor capture without storing it
  backup FILE                               write a consistent copy of the live database
`;

function parse(argv: string[], options: ParseArgsConfig['options'], positionals: number) {
  let r;
  try {
    r = parseArgs({ args: argv, options, allowPositionals: true, strict: true });
  } catch (e) {
    throw new UsageError((e as Error).message);
  }
  if (r.positionals.length !== positionals) {
    throw new UsageError(`expected ${positionals} argument${positionals === 1 ? '' : 's'}, got ${r.positionals.length}`);
  }
  return r as { values: Record<string, string | boolean | undefined>; positionals: string[] };
}

function need(values: Record<string, string | boolean | undefined>, key: string): string {
  const v = values[key];
  if (typeof v !== 'string' || v === '') throw new UsageError(`--${key} is required`);
  return v;
}

async function main(argv: string[]): Promise<number> {
  const [command, ...rest] = argv;
  if (!command || command === '--help' || command === 'help' || command === '-h') {
    process.stdout.write(USAGE);
    return command ? 0 : 2;
  }
  if (command === 'trace') {
    // Light path: the trace analysis needs no database.
    const { runTraceCommand } = await import('./commands/trace');
    return runTraceCommand(rest);
  }
  const { getDb, runMigrations, closeDb } = await import('../db/client');
  const actor = { system: 'cli' as const };
  try {
    switch (command) {
      case 'migrate': {
        parse(rest, {}, 0);
        runMigrations(getDb());
        console.log('Migrations applied.');
        return 0;
      }
      case 'seed-demo': {
        parse(rest, {}, 0);
        runMigrations(getDb());
        const { seedDemo } = await import('../../seed/demo');
        try {
          const s = await seedDemo(getDb());
          // The demo opens with its patterns on record, as if a fleet manager had looked at Patterns today.
          const { syncPatternRecords } = await import('../server/patterns-records');
          const sync = syncPatternRecords(null);
          console.log(`Demo scenario loaded: ${JSON.stringify({ ...s, patternRecords: sync.created })}`);
        } catch (e) {
          throw new HandledError((e as Error).message);
        }
        return 0;
      }
      case 'user-add': {
        const { values } = parse(
          rest,
          { email: { type: 'string' }, name: { type: 'string' }, role: { type: 'string' }, password: { type: 'string' }, depots: { type: 'string' }, json: { type: 'boolean' } },
          0,
        );
        const { UserCreateSchema } = await import('../lib/contracts/users');
        const input = UserCreateSchema.parse({
          email: need(values, 'email'),
          name: need(values, 'name'),
          role: need(values, 'role'),
          password: need(values, 'password'),
          depots: typeof values.depots === 'string' ? values.depots : undefined,
          allDepots: need(values, 'role') === 'viewer' && !values.depots ? true : undefined,
        });
        runMigrations(getDb());
        const { createUser } = await import('../server/users');
        const { id } = await createUser(input, actor);
        if (values.json) console.log(JSON.stringify({ id, email: input.email.toLowerCase(), role: input.role }));
        else console.log(`Created ${input.role} ${input.email.toLowerCase()} (id ${id}).`);
        return 0;
      }
      case 'token-create': {
        const { values } = parse(rest, { email: { type: 'string' }, label: { type: 'string' } }, 0);
        const email = need(values, 'email').trim().toLowerCase();
        runMigrations(getDb());
        const { eq } = await import('drizzle-orm');
        const { users } = await import('../db/schema');
        const u = getDb().select({ id: users.id }).from(users).where(eq(users.email, email)).get();
        if (!u) throw new HandledError(`No person with e-mail ${email}.`);
        const { createToken } = await import('../server/users');
        const t = createToken(u.id, typeof values.label === 'string' ? values.label : 'CLI token', actor);
        console.log(`Token for ${email} (shown once; store it now):`);
        console.log(t.token);
        return 0;
      }
      case 'import': {
        const { values, positionals } = parse(rest, { 'dry-run': { type: 'boolean' }, json: { type: 'boolean' } }, 2);
        const [kind, file] = positionals as [string, string];
        const { IMPORT_KINDS } = await import('../lib/imports/rows');
        if (!(IMPORT_KINDS as readonly string[]).includes(kind)) throw new UsageError(`unknown import kind "${kind}" (depots, modules, vehicles, defects)`);
        let text: string;
        try {
          const bytes = fs.readFileSync(file);
          text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
        } catch (e) {
          throw new HandledError(
            (e as NodeJS.ErrnoException).code === 'ENOENT' ? `File not found: ${file}` : `Cannot read ${file} as UTF-8 text: ${(e as Error).message}`,
          );
        }
        runMigrations(getDb());
        const { runImport } = await import('../server/imports');
        const result = runImport(kind as 'depots', text, { dryRun: Boolean(values['dry-run']), actor: { system: 'import' } });
        if (values.json) console.log(JSON.stringify(result, null, 2));
        else {
          const verb = result.dryRun ? 'would be' : 'were';
          console.log(`${result.rows} rows: ${result.inserted} inserted, ${result.updated} updated, ${result.unchanged} unchanged ${verb} applied${result.dryRun ? ' (dry run, nothing written)' : ''}.`);
          for (const w of result.warnings) console.log(`warning row ${w.row} ${w.column}: ${w.message}`);
          for (const e of result.errors) console.log(`error row ${e.row} ${e.column}: ${e.message}`);
        }
        if (result.errors.length) {
          process.stderr.write(`Import refused: ${result.errors.length} row error(s); nothing was written.\n`);
          return 1;
        }
        return 0;
      }
      case 'patterns': {
        const { values } = parse(rest, { 'as-of': { type: 'string' }, json: { type: 'boolean' } }, 0);
        runMigrations(getDb());
        const { getPatternsReport, parseAsOfParam, patternsResponse } = await import('../server/patterns');
        const asOf = parseAsOfParam(typeof values['as-of'] === 'string' ? values['as-of'] : undefined);
        const everyone = { id: 0, email: 'cli', name: 'CLI', role: 'admin' as const, depotIds: null, via: 'token' as const };
        const report = patternsResponse(getPatternsReport(everyone, asOf));
        if (values.json) console.log(JSON.stringify(report, null, 2));
        else {
          const flagged = report.cohorts.filter((c) => c.significant);
          console.log(`Patterns as of ${asOf}: ${report.cohorts.length} cohorts tested, ${flagged.length} significant.`);
          for (const c of flagged) {
            console.log(`  ${c.moduleCode} ${c.buildFrom}..${c.buildTo} ${c.exposureBand}: ${c.failures} failures vs ${c.expected.toFixed(1)} expected, rate ratio ${c.rateRatio?.toFixed(2) ?? '∞'}, q ${c.qValue.toExponential(2)}${c.waterIngress ? ', water ingress' : ''}`);
          }
        }
        return 0;
      }
      case 'backup': {
        const { positionals } = parse(rest, {}, 1);
        const target = path.resolve(positionals[0]!);
        if (fs.existsSync(target)) throw new HandledError(`${target} already exists; choose a new file name.`);
        fs.mkdirSync(path.dirname(target), { recursive: true });
        await getDb().$client.backup(target);
        console.log(`Backup written to ${target}.`);
        return 0;
      }
      default:
        throw new UsageError(`unknown command "${command}"`);
    }
  } finally {
    closeDb();
  }
}

main(process.argv.slice(2))
  .then((code) => {
    process.exitCode = code;
  })
  .catch(async (e: unknown) => {
    if (e instanceof UsageError) {
      process.stderr.write(`seepline: ${e.message} (npm run cli -- --help lists the commands)\n`);
      process.exitCode = 2;
      return;
    }
    if (e instanceof ZodError) {
      process.stderr.write(`seepline: ${e.issues.map((i) => `${i.path.join('.') || 'input'}: ${i.message}`).join('; ')}\n`);
      process.exitCode = 1;
      return;
    }
    const { HttpError } = await import('../server/http');
    if (e instanceof HandledError || e instanceof HttpError) {
      process.stderr.write(`seepline: ${e.message}\n`);
      process.exitCode = 1;
      return;
    }
    process.stderr.write(`seepline: unexpected error: ${(e as Error).stack ?? String(e)}\n`);
    process.exitCode = 1;
  });
