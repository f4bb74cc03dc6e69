// Headless Chromium for the browser tests and the explorer bench, from the npm registry only.
//
// The browser is the headless-shell build of Chromium that ships brotli-compressed inside the devDependency
// `@sparticuz/chromium` (Linux x64). It is inflated once into a private cache folder under the system temp
// folder (one folder per package version, guarded by a lock so that parallel test files do not race) and driven
// through playwright-core. Nothing is downloaded at install or run time: no system browser is used and none is
// fetched. When the browser cannot be had the launch FAILS with a message saying why: tests are never skipped.
import { createRequire } from 'node:module';
import { existsSync, mkdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import type { Browser } from 'playwright-core';

/** Flags for a sandbox-less headless run on a CI machine (root, no GPU, no network). */
export const BROWSER_ARGS: readonly string[] = [
  '--no-sandbox',
  '--no-zygote',
  '--disable-gpu',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--disable-dev-shm-usage',
];

const PACKAGE = '@sparticuz/chromium';
const LOCK_WAIT_MS = 180_000;
const STALE_LOCK_MS = 600_000;

function packageVersion(): string {
  const require = createRequire(import.meta.url);
  try {
    // the package's exports do not include package.json: walk up from the resolved entry point
    let dir = dirname(require.resolve(PACKAGE));
    for (;;) {
      const manifest = join(dir, 'package.json');
      if (existsSync(manifest)) {
        const parsed = JSON.parse(readFileSync(manifest, 'utf8')) as { name?: string; version?: string };
        if (parsed.name === PACKAGE && typeof parsed.version === 'string') return parsed.version;
      }
      const parent = dirname(dir);
      if (parent === dir) throw new Error('its package.json was not found');
      dir = parent;
    }
  } catch (err) {
    throw new Error(
      `${PACKAGE} is not installed (${(err as Error).message}): the browser tests need it; run \`npm install\` ` +
        '(it is a devDependency that ships Chromium inside the package). The tests are not skipped.',
    );
  }
}

function sleep(ms: number): Promise<void> {
  return new Promise((resolve) => setTimeout(resolve, ms));
}

/** Take the folder lock (mkdir is atomic); a lock older than STALE_LOCK_MS is taken over. */
async function withLock<T>(lock: string, body: () => Promise<T>): Promise<T> {
  const start = Date.now();
  for (;;) {
    try {
      mkdirSync(lock);
      break;
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code !== 'EEXIST') throw err;
      let age = 0;
      try {
        age = Date.now() - statSync(lock).mtimeMs;
      } catch {
        continue; // released meanwhile
      }
      if (age > STALE_LOCK_MS) {
        rmSync(lock, { recursive: true, force: true });
        continue;
      }
      if (Date.now() - start > LOCK_WAIT_MS) throw new Error(`timed out waiting for ${lock} (another test is inflating the browser)`);
      await sleep(200);
    }
  }
  try {
    return await body();
  } finally {
    rmSync(lock, { recursive: true, force: true });
  }
}

export interface BundledBrowser {
  /** path of the inflated headless-shell binary */
  executablePath: string;
  /** fontconfig file listing the fonts shipped with the package and the system's, for the browser's environment */
  fontconfigFile: string;
}

/** Inflate (once per package version) the Chromium shipped in @sparticuz/chromium and return where it is. */
export async function bundledBrowser(): Promise<BundledBrowser> {
  if (process.platform !== 'linux' || process.arch !== 'x64') {
    throw new Error(`${PACKAGE} ships Chromium for Linux x64 only; this is ${process.platform} ${process.arch}. The browser tests are not skipped.`);
  }
  const version = packageVersion();
  const dir = join(tmpdir(), `bandbend-chromium-${version}`);
  const ready = join(dir, 'READY');
  const fontconfigFile = join(dir, 'bandbend-fonts.conf');
  const executablePath = join(dir, 'chromium');
  if (!existsSync(ready)) {
    await withLock(`${dir}.lock`, async () => {
      if (existsSync(ready)) return;
      rmSync(dir, { recursive: true, force: true });
      mkdirSync(dir, { recursive: true });
      // @sparticuz/chromium inflates into os.tmpdir(), read at call time: point it at the private folder
      const saved = process.env['TMPDIR'];
      process.env['TMPDIR'] = dir;
      try {
        const { default: Chromium } = (await import(PACKAGE)) as typeof import('@sparticuz/chromium');
        const path = await Chromium.executablePath();
        if (path !== executablePath) throw new Error(`${PACKAGE} inflated the browser to ${path}, expected ${executablePath}`);
      } finally {
        if (saved === undefined) delete process.env['TMPDIR'];
        else process.env['TMPDIR'] = saved;
      }
      writeFileSync(
        fontconfigFile,
        [
          '<?xml version="1.0"?>',
          '<!DOCTYPE fontconfig SYSTEM "fonts.dtd">',
          '<fontconfig>',
          `  <dir>${join(dir, 'fonts')}</dir>`,
          '  <dir>/usr/share/fonts</dir>',
          `  <cachedir>${join(dir, 'fonts-cache')}</cachedir>`,
          '</fontconfig>',
          '',
        ].join('\n'),
      );
      writeFileSync(ready, `${version}\n`);
    });
  }
  if (!existsSync(executablePath)) throw new Error(`${executablePath} is missing after inflating ${PACKAGE}; delete ${dir} and retry`);
  return { executablePath, fontconfigFile };
}

/** Launch the bundled headless Chromium. Fails loudly (never skips) when it cannot. */
export async function launchBrowser(): Promise<Browser> {
  const { executablePath, fontconfigFile } = await bundledBrowser();
  // a devDependency: loaded on use, so that nothing in the published package needs it
  const { chromium } = await import('playwright-core');
  try {
    return await chromium.launch({
      executablePath,
      args: [...BROWSER_ARGS],
      headless: true,
      env: { ...process.env, FONTCONFIG_FILE: fontconfigFile },
    });
  } catch (err) {
    throw new Error(`could not start the Chromium shipped in ${PACKAGE} (${executablePath}): ${(err as Error).message}`);
  }
}
