/**
 * Standalone entry for the trace command (`node --import tsx src/cli/trace-main.ts FILE --json`), used by
 * the benchmark and bundling; the main CLI calls runTraceCommand directly. Edit only if the entry changes.
 */
import { runTraceCommand } from './commands/trace';

process.exitCode = await runTraceCommand(process.argv.slice(2));
