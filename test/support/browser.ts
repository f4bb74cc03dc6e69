// Headless Chromium for browser tests: the launcher lives in src/bench/browserLaunch.ts (the explorer bench uses it
// too); see there for how the Chromium shipped inside @sparticuz/chromium is inflated and started.
export { BROWSER_ARGS, bundledBrowser, launchBrowser, type BundledBrowser } from '../../src/bench/browserLaunch.js';
