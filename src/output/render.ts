// Vega-Lite spec -> Vega -> SVG, headless (renderer 'none': no browser, no canvas, no fonts, no network).
import { mkdir, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import type * as Vega from 'vega';
import type { compile, TopLevelSpec } from 'vega-lite';
import { isSafeBaseName } from './escape.js';

type VlLogger = NonNullable<NonNullable<Parameters<typeof compile>[1]>['logger']>;
type VgSpec = ReturnType<typeof compile>['spec'];

export interface CompiledSpec {
  vega: VgSpec;
  /** messages the Vega-Lite compiler logged (warnings and above), in order */
  warnings: string[];
}

/** A Vega-Lite logger that collects messages instead of printing them. */
function collectingLogger(sink: string[]): VlLogger {
  let current = 2; // vega-util Warn
  const push =
    (label: string) =>
    (...args: readonly unknown[]) => {
      sink.push(`${label}: ${args.map((a) => String(a)).join(' ')}`);
      return logger;
    };
  const logger = {
    level(level?: number) {
      if (level === undefined) return current;
      current = level;
      return logger;
    },
    error: push('error'),
    warn: push('warn'),
    info: () => logger,
    debug: () => logger,
  } as unknown as VlLogger;
  return logger;
}

/**
 * Compile a Vega-Lite spec to Vega, collecting compiler warnings. vega and vega-lite are ES modules only and are
 * loaded here, at first use, by import() (the CLI bundle is CommonJS for its start-up code cache, src/cli/bundle.ts,
 * and could not require() them; nothing that does not draw a figure pays for loading them).
 */
export async function compileSpec(spec: TopLevelSpec): Promise<CompiledSpec> {
  const { compile: compileVegaLite } = await import('vega-lite');
  const warnings: string[] = [];
  const out = compileVegaLite(spec, { logger: collectingLogger(warnings) });
  return { vega: out.spec, warnings };
}

/** A loader that refuses every URL or file (our specs carry inline data only) and records the attempts. */
function offlineLoader(refused: string[]): Vega.Loader {
  const refuse = (uri: string): Promise<never> => {
    refused.push(uri);
    return Promise.reject(new Error(`external resource "${uri}" refused`));
  };
  return {
    load: (uri: string) => refuse(uri),
    sanitize: (uri: string) => refuse(uri),
    http: (uri: string) => refuse(uri),
    file: (filename: string) => refuse(filename),
  };
}

/** Parse the numeric width/height attributes of the root <svg> element. */
export function svgSize(svg: string): { width: number; height: number } {
  const root = /<svg\b[^>]*>/.exec(svg)?.[0] ?? '';
  const width = Number(/\swidth="([\d.]+)"/.exec(root)?.[1] ?? NaN);
  const height = Number(/\sheight="([\d.]+)"/.exec(root)?.[1] ?? NaN);
  return { width, height };
}

/**
 * Render a Vega-Lite spec to a standalone SVG string with explicit width and height.
 * Text widths are estimated by Vega (no canvas, no font files); external loads are refused.
 */
export async function renderSvg(spec: TopLevelSpec): Promise<string> {
  const [{ vega: vgSpec }, vega] = await Promise.all([compileSpec(spec), import('vega')]);
  const refused: string[] = [];
  const view = new vega.View(vega.parse(vgSpec), {
    renderer: 'none',
    loader: offlineLoader(refused),
    logLevel: 1, // vega-util Error: keep the console quiet apart from real errors
  });
  try {
    const svg = await view.toSVG();
    if (refused.length > 0) {
      throw new Error(`figure tried to load external resource(s) ${refused.map((u) => `"${u}"`).join(', ')}; only inline data is allowed`);
    }
    const { width, height } = svgSize(svg);
    if (!(width > 0) || !(height > 0)) {
      throw new Error(`rendered SVG has no usable size (width=${width}, height=${height})`);
    }
    return svg;
  } finally {
    view.finalize();
  }
}

/**
 * Write `<baseName>.svg` and `<baseName>.vl.json` (the Vega-Lite source, pretty-printed) into dir.
 * baseName must be a plain file name (letters, digits, . _ -).
 */
export async function writeFigure(
  dir: string,
  baseName: string,
  spec: TopLevelSpec,
): Promise<{ svgPath: string; specPath: string }> {
  if (!isSafeBaseName(baseName)) {
    throw new Error(`figure name "${baseName}" is not a plain file name (letters, digits, . _ -)`);
  }
  const svg = await renderSvg(spec);
  await mkdir(dir, { recursive: true });
  const svgPath = join(dir, `${baseName}.svg`);
  const specPath = join(dir, `${baseName}.vl.json`);
  await writeFile(svgPath, svg.endsWith('\n') ? svg : `${svg}\n`, 'utf8');
  await writeFile(specPath, `${JSON.stringify(spec, null, 2)}\n`, 'utf8');
  return { svgPath, specPath };
}

/**
 * Prepare a standalone SVG for inlining in an HTML5 page: drop the XML namespace declarations
 * (implied by the HTML parser) and let it scale down to the page width.
 */
export function svgForInline(svg: string, label: string): string {
  return svg.replace(/<svg\b([^>]*)>/, (_m, attrs: string) => {
    const cleaned = attrs
      .replace(/\sxmlns(:\w+)?="[^"]*"/g, '')
      .replace(/\sversion="[^"]*"/, '');
    const aria = ` role="img" aria-label="${label.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`)}"`;
    return `<svg${cleaned}${aria} style="max-width:100%;height:auto">`;
  });
}
