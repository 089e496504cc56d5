// Opening a report page in Debian's Chromium, offline, and collecting what a reader would hit:
// console errors, page errors, attempted network requests, and each image's decoded size.
import { existsSync } from 'node:fs';
import { pathToFileURL } from 'node:url';

export const CHROMIUM = '/usr/bin/chromium';
export const haveChromium = existsSync(CHROMIUM);

// The page's globals, as far as the checks use them: the test program is compiled without the
// DOM library, and these declarations stay local to this module.
interface Box {
  getBoundingClientRect(): { width: number; height: number };
}
interface PageImage extends Box {
  alt: string;
  complete: boolean;
  naturalWidth: number;
  naturalHeight: number;
}
declare const document: {
  images: ArrayLike<PageImage>;
  scripts: { length: number };
  title: string;
  querySelectorAll(selector: string): ArrayLike<Box>;
  querySelector(selector: string): { textContent: string | null } | null;
  getElementById(id: string): Box | null;
  documentElement: { scrollWidth: number };
};
declare const innerWidth: number;

export interface PageFindings {
  consoleErrors: string[];
  pageErrors: string[];
  foreign: string[];
  images: { alt: string; complete: boolean; nw: number; nh: number; w: number; h: number }[];
  svgs: { w: number; h: number }[];
  scripts: number;
  description: string | null;
  safety: { w: number; h: number };
  title: string;
  /** How far the page reaches past the window's width (px; 0 or less: no sideways scrolling), at 1280 and 800 px. */
  overflow: { width: number; over: number }[];
}

export async function openOffline(file: string): Promise<PageFindings> {
  const { chromium } = await import('playwright-core');
  // playwright-core already passes --headless, --no-sandbox (chromiumSandbox is off by default),
  // --disable-background-networking, --disable-component-update, --no-first-run, --disable-sync
  // and a fresh --user-data-dir of its own that it deletes on close (it refuses one in args).
  // Repeated here where they matter for an offline root run, plus the two it does not set.
  const browser = await chromium.launch({
    executablePath: CHROMIUM,
    timeout: 60_000,
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
  });
  try {
    const context = await browser.newContext({ offline: true });
    const consoleErrors: string[] = [];
    const pageErrors: string[] = [];
    const foreign: string[] = [];
    const isLocal = (u: string) => u.startsWith('file:') || u.startsWith('data:');
    await context.route('**/*', (route) => {
      const u = route.request().url();
      if (isLocal(u)) return route.continue();
      foreign.push(u);
      return route.abort('blockedbyclient');
    });
    const page = await context.newPage();
    page.setDefaultTimeout(30_000);
    page.on('console', (m) => {
      if (m.type() === 'error') consoleErrors.push(m.text());
    });
    page.on('pageerror', (e) => pageErrors.push(e.message));
    page.on('request', (r) => {
      if (!isLocal(r.url())) foreign.push(r.url());
    });
    await page.goto(pathToFileURL(file).href, { waitUntil: 'load', timeout: 30_000 });
    const seen = await page.evaluate(() => {
      const box = (e: Box | null) => {
        if (!e) return { w: 0, h: 0 };
        const r = e.getBoundingClientRect();
        return { w: r.width, h: r.height };
      };
      return {
        images: Array.from(document.images).map((i) => ({ alt: i.alt, complete: i.complete, nw: i.naturalWidth, nh: i.naturalHeight, ...box(i) })),
        svgs: Array.from(document.querySelectorAll('svg')).map(box),
        scripts: document.scripts.length,
        description: document.querySelector('.description')?.textContent ?? null,
        safety: box(document.getElementById('safety')),
        title: document.title,
      };
    });
    const overflow: { width: number; over: number }[] = [];
    for (const width of [1280, 800]) {
      await page.setViewportSize({ width, height: 900 });
      overflow.push({ width, over: await page.evaluate(() => document.documentElement.scrollWidth - innerWidth) });
    }
    return { consoleErrors, pageErrors, foreign, ...seen, overflow };
  } finally {
    await browser.close();
  }
}
