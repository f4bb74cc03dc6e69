// `bandbend explore`: the explorer page (built by `npm run build` into dist/explorer/) served on 127.0.0.1,
// or copied with --out to a folder any web host can serve. The server module is loaded on use.
import type { Command } from 'commander';

const EXAMPLES = `
Examples:
  bandbend explore                         # serve on a free port and open the system browser
  bandbend explore --port 8400 --no-open   # a fixed port; print the address only
  bandbend explore --out site/explorer     # copy the page for a web host (any static file server)`;

async function runExplore(opts: Record<string, unknown>): Promise<void> {
  const server = await import('./exploreServer.js');
  server.checkExploreFlags(opts);
  if (typeof opts['out'] === 'string') {
    const dir = server.exportExplorer(opts['out'], opts['force'] === true);
    process.stdout.write(`explorer page written to ${dir} (serve the folder with any static web server; index.html is the page)\n`);
    return;
  }
  const port = server.parsePort(opts['port']);
  const running = await server.serveExplorer({ port });
  process.stdout.write(`bandbend explorer: ${running.url}\n(press Ctrl+C to stop)\n`);
  if (opts['open'] !== false) server.openBrowser(running.url);
  await running.closed;
}

export function registerExplore(program: Command): void {
  program
    .command('explore')
    .description('the explorer page: sliders, live band diagram and sweeps in the browser (served on 127.0.0.1)')
    .option('--port <N>', 'port on 127.0.0.1 (default: 0 = any free port)')
    .option('--no-open', 'do not open the system browser')
    .option('--out <DIR>', 'copy the built page to DIR instead of serving it')
    .option('--force', 'with --out: write into a non-empty DIR')
    .addHelpText('after', EXAMPLES)
    .action(runExplore);
}
