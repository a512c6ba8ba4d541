import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { runCli, tempDir } from '../helpers/run-cli.js';
import type { FloorGraph } from '../../src/model/floor-graph.js';
import { buildReportData } from '../../src/report/build-report-data.js';
import { renderReport, REPORT_SECTIONS } from '../../src/report/render-report.js';
import { reportFixture, HOSTILE } from '../report/report-fixture.js';
import { decodePng, pixelStats } from '../report/decode-png.js';

/** Debian's Chromium (`.ci/run` installs it); never a browser downloaded by a test tool. */
const CHROMIUM = process.env.UNDERFOOT_CHROMIUM ?? '/usr/bin/chromium';
/** Flags for this machine's closed network (see the environment notes): no background connections. */
const FLAGS = ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'];
/** Where the screenshot is left for people to look at. */
const SCREENSHOT_DIR = join(tmpdir(), 'underfoot-test-output');

/** The invented Larkspur Reading Rooms: two levels, five rooms (each a zone), a lift, a one-way loop through the store. */
function larkspurFloor(): FloorGraph {
  const zoneOf: Record<string, string> = { FOY: 'Larkspur foyer', RDG: 'Reading room', CAF: 'Tea room', STO: 'Book store', GAL: 'Upper gallery', OFF: 'Archive office' };
  const rooms = [
    { name: 'FOY', level: 0, x0: 0, y0: 0, w: 4, h: 3, surface: 'tile', start: true },
    { name: 'RDG', level: 0, x0: 4, y0: 0, w: 6, h: 4, surface: 'carpet', start: false },
    { name: 'CAF', level: 0, x0: 0, y0: 3, w: 4, h: 2, surface: 'oak', start: false },
    { name: 'STO', level: 0, x0: 10, y0: 0, w: 2, h: 3, surface: 'concrete', start: false },
    { name: 'GAL', level: 1, x0: 0, y0: 0, w: 4, h: 4, surface: 'laminate', start: false },
    { name: 'OFF', level: 1, x0: 4, y0: 0, w: 4, h: 4, surface: 'rubber', start: false },
  ];
  const cells: FloorGraph['cells'] = [];
  const links: FloorGraph['links'] = [];
  const id = (name: string, level: number, x: number, y: number) => `L${level}-${name}-${String(x).padStart(2, '0')}-${String(y).padStart(2, '0')}`;
  for (const r of rooms) {
    for (let y = r.y0; y < r.y0 + r.h; y++) {
      for (let x = r.x0; x < r.x0 + r.w; x++) {
        cells.push({ id: id(r.name, r.level, x, y), surface: r.surface, x: x + 0.5, y: y + 0.5, level: r.level, start: r.start && x === r.x0, zone: zoneOf[r.name] });
        if (x + 1 < r.x0 + r.w) links.push({ from: id(r.name, r.level, x, y), to: id(r.name, r.level, x + 1, y), oneway: false });
        if (y + 1 < r.y0 + r.h) links.push({ from: id(r.name, r.level, x, y), to: id(r.name, r.level, x, y + 1), oneway: false });
      }
    }
  }
  links.push(
    { from: id('FOY', 0, 3, 1), to: id('RDG', 0, 4, 1), oneway: false },
    { from: id('FOY', 0, 1, 2), to: id('CAF', 0, 1, 3), oneway: false },
    { from: id('RDG', 0, 9, 1), to: id('STO', 0, 10, 1), oneway: true },
    { from: id('STO', 0, 10, 0), to: id('RDG', 0, 9, 0), oneway: true },
    { from: id('RDG', 0, 9, 3), to: id('OFF', 1, 7, 3), oneway: false },
    { from: id('GAL', 1, 3, 1), to: id('OFF', 1, 4, 1), oneway: false },
  );
  return { format: 'underfoot-floor/1', name: 'Larkspur Reading Rooms (invented)', surfaces: ['oak', 'laminate', 'carpet', 'tile', 'rubber', 'concrete'], cells, links };
}

interface Visit {
  consoleErrors: string[];
  pageErrors: string[];
  dialogs: string[];
  requests: string[];
}

const tmp = tempDir('underfoot-browser-');
const p = tmp.path;
let context: BrowserContext;
let profile: string;

/** Opens a report from its file URL, recording console errors, page errors, dialogs and every request; anything but the report itself is aborted. */
async function visit(file: string): Promise<{ page: Page; seen: Visit }> {
  if (!context) throw new Error(MISSING);
  const url = pathToFileURL(file).href;
  const page = await context.newPage();
  const seen: Visit = { consoleErrors: [], pageErrors: [], dialogs: [], requests: [] };
  page.on('console', (m) => {
    if (m.type() === 'error') seen.consoleErrors.push(m.text());
  });
  page.on('pageerror', (e) => seen.pageErrors.push(e.message));
  page.on('dialog', (d) => {
    seen.dialogs.push(d.message());
    void d.dismiss();
  });
  page.on('request', (r) => seen.requests.push(r.url()));
  await page.route('**/*', (route) => (route.request().url() === url ? route.continue() : route.abort()));
  await page.goto(url, { waitUntil: 'load' });
  return { page, seen };
}

const MISSING = `${CHROMIUM}: Chromium must be installed for the report's browser tests (apt-get install -y chromium; .ci/run does it), got no such file`;

beforeAll(async () => {
  // Without Chromium every test below fails (never skips): see the first test and visit().
  if (!existsSync(CHROMIUM)) return;
  // The demo-like report, through the built command: simulate → fit → decode → report.
  writeFileSync(p('floor.json'), JSON.stringify(larkspurFloor()));
  const steps: string[][] = [
    ['simulate', '--floor', p('floor.json'), '--runs', '16', '--steps', '300', '--seed', '4', '--hit', '0.8', '--dwell', '0.6', '--dropout-rate', '0.02', '--out', p('runs.csv'), '--quiet'],
    ['fit', '--floor', p('floor.json'), '--runs', p('runs.csv'), '--out', p('model.json'), '--restarts', '3', '--max-iter', '40', '--tol', '1e-5', '--workers', '1', '--quiet'],
    ['decode', '--model', p('model.json'), '--runs', p('runs.csv'), '--out', p('annotated.arrow'), '--summary', p('summary.csv'), '--quiet'],
    ['report', '--model', p('model.json'), '--floor', p('floor.json'), '--annotated', p('annotated.arrow'), '--summary', p('summary.csv'), '--sim-runs', '40', '--out', p('report.html')],
  ];
  for (const args of steps) {
    const r = runCli(args);
    if (r.code !== 0) throw new Error(`underfoot ${args[0]} failed: ${r.stderr}`);
  }
  // The hostile report: markup in the building name, a cell id, a surface name and a run id.
  writeFileSync(p('hostile.html'), renderReport(buildReportData(reportFixture(true))));
  profile = mkdtempSync(join(tmpdir(), 'underfoot-chromium-profile-'));
  context = await chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM,
    headless: true,
    args: FLAGS,
    viewport: { width: 1280, height: 900 },
  });
}, 60_000);

afterAll(async () => {
  await context?.close();
  if (profile) rmSync(profile, { recursive: true, force: true });
  tmp.remove();
});

describe('the HTML report in headless Chromium', () => {
  it(`finds Debian's Chromium at ${CHROMIUM}`, () => {
    expect(existsSync(CHROMIUM), MISSING).toBe(true);
  });

  it('opens from a file URL with no console errors, no script, no request but the file itself, and every section', async () => {
    const { page, seen } = await visit(p('report.html'));
    expect(seen.consoleErrors).toEqual([]);
    expect(seen.pageErrors).toEqual([]);
    expect(seen.requests).toEqual([pathToFileURL(p('report.html')).href]);
    expect(await page.evaluate(() => document.scripts.length)).toBe(0);
    for (const [id, label] of REPORT_SECTIONS) {
      const section = page.locator(`section#${id}`);
      expect(await section.count(), id).toBe(1);
      expect(await section.isVisible(), id).toBe(true);
      expect(await section.locator('h2').innerText(), id).toBe(label);
    }
    expect(await page.locator('section#floor-map svg.floor-map').count()).toBe(2);
    expect(await page.locator('h1').innerText()).toBe('Larkspur Reading Rooms (invented)');
    // Zone names on the floor maps, and the per-zone table in the ambiguity section.
    const names = await page.locator('section#floor-map .zone-names text').allTextContents();
    expect(names.sort()).toEqual(['Archive office', 'Book store', 'Larkspur foyer', 'Reading room', 'Tea room', 'Upper gallery']);
    expect(await page.locator('section#floor-map .zone-names text', { hasText: 'Reading room' }).isVisible()).toBe(true);
    const zoneTable = page.locator('section#ambiguity table', { hasText: 'zone recovered' });
    expect(await zoneTable.locator('tbody tr').count()).toBe(6);
    await page.close();
  });

  it('switches floor-map overlays without script (radio buttons and CSS)', async () => {
    const { page } = await visit(p('report.html'));
    const shown = (key: string) => page.locator(`section#floor-map .layer-${key}`).first().evaluate((el) => getComputedStyle(el).display !== 'none');
    expect(await shown('surface')).toBe(true);
    expect(await shown('visits')).toBe(false);
    await page.click('label[for="ov-visits"]');
    expect(await shown('surface')).toBe(false);
    expect(await shown('visits')).toBe(true);
    expect(await page.locator('.lg-visits').isVisible()).toBe(true);
    await page.close();
  });

  it('renders a screenshot that is not blank, written for people to look at', async () => {
    const { page } = await visit(p('report.html'));
    mkdirSync(SCREENSHOT_DIR, { recursive: true });
    const file = join(SCREENSHOT_DIR, 'report-screenshot.png');
    await page.screenshot({ path: file, fullPage: true });
    await page.close();
    const img = decodePng(readFileSync(file));
    const stats = pixelStats(img);
    expect(img.width).toBe(1280);
    expect(img.height).toBeGreaterThan(2000); // six sections, a long page
    // A blank page has variance 0 and one colour; the report has maps, charts and text.
    expect(stats.variance).toBeGreaterThan(300);
    expect(stats.colours).toBeGreaterThan(500);
    console.log(`report screenshot: ${file} (${img.width} × ${img.height}, luma variance ${stats.variance.toFixed(0)}, ${stats.colours} colours)`);
  });

  it.each([390, 1024, 1440])('reads at %i px: no text cell narrower than its longest word, no SVG text clipped or overlapping, with every overlay', async (width) => {
    const { page } = await visit(p('report.html'));
    await page.setViewportSize({ width, height: 900 });
    const radios = await page.$$eval('input.ov-radio', (rs) => rs.map((r) => r.id));
    const problems: string[] = [];
    for (const radio of [null, ...radios]) {
      if (radio) await page.evaluate((id) => ((document.getElementById(id) as HTMLInputElement).checked = true), radio);
      problems.push(
        ...(await page.evaluate((radio) => {
          const found: string[] = [];
          // Table cells: the longest word of the cell's text must fit inside the cell (no mid-word breaks).
          const ctx = document.createElement('canvas').getContext('2d') as CanvasRenderingContext2D;
          for (const td of Array.from(document.querySelectorAll('td, th')) as HTMLElement[]) {
            if (td.offsetParent === null) continue;
            const cs = getComputedStyle(td);
            ctx.font = `${cs.fontWeight} ${cs.fontSize} ${cs.fontFamily}`;
            const words = (td.textContent ?? '').split(/\s+/).filter(Boolean);
            const longest = Math.max(0, ...words.map((w) => ctx.measureText(w).width));
            const inner = td.clientWidth - parseFloat(cs.paddingLeft) - parseFloat(cs.paddingRight);
            if (longest > inner + 1) found.push(`${radio}: cell "${td.textContent}" is ${inner.toFixed(0)} px for a ${longest.toFixed(0)} px word`);
          }
          // SVG text: inside its drawing, and not on top of another label of the same drawing.
          const boxes = new Map<SVGSVGElement, Array<{ r: DOMRect; text: string }>>();
          for (const t of Array.from(document.querySelectorAll('svg text')) as SVGTextElement[]) {
            const svg = t.ownerSVGElement as SVGSVGElement;
            const r = t.getBoundingClientRect();
            if (r.width === 0 || svg.getBoundingClientRect().width === 0) continue;
            const b = svg.getBoundingClientRect();
            if (r.left < b.left - 0.5 || r.right > b.right + 0.5 || r.top < b.top - 0.5 || r.bottom > b.bottom + 0.5) {
              found.push(`${radio}: text "${t.textContent}" is clipped by its drawing`);
            }
            const list = boxes.get(svg) ?? [];
            boxes.set(svg, list);
            for (const o of list) {
              const dx = Math.min(r.right, o.r.right) - Math.max(r.left, o.r.left);
              const dy = Math.min(r.bottom, o.r.bottom) - Math.max(r.top, o.r.top);
              if (dx > 1 && dy > 1 && !svg.classList.contains('floor-map')) found.push(`${radio}: text "${t.textContent}" overlaps "${o.text}"`);
            }
            list.push({ r, text: t.textContent ?? '' });
          }
          return found;
        }, radio)),
      );
    }
    mkdirSync(SCREENSHOT_DIR, { recursive: true });
    await page.screenshot({ path: join(SCREENSHOT_DIR, `report-${width}px.png`), fullPage: true });
    // Nothing sticks out of the page sideways: wide tables and maps scroll inside their own box.
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(width);
    await page.close();
    expect([...new Set(problems)]).toEqual([]);
  });

  it('shows hostile labels from the floor and the runs as text, and runs nothing', async () => {
    const { page, seen } = await visit(p('hostile.html'));
    expect(seen.dialogs).toEqual([]);
    expect(seen.consoleErrors).toEqual([]);
    expect(seen.pageErrors).toEqual([]);
    expect(seen.requests).toEqual([pathToFileURL(p('hostile.html')).href]);
    expect(await page.evaluate(() => [document.scripts.length, document.images.length, document.querySelectorAll('b').length])).toEqual([0, 0, 0]);
    expect(await page.locator('h1').innerText()).toBe(HOSTILE.building);
    expect(await page.title()).toBe(`${HOSTILE.building} · underfoot report`);
    const text = await page.locator('body').innerText();
    expect(text).toContain(HOSTILE.run); // in the runs tables
    expect(text).toContain(HOSTILE.surface); // in the legend and the emission table's rows
    expect(text).toContain(HOSTILE.zone); // in the zone table
    const zoneNames = await page.locator('.zone-names text').allTextContents();
    expect(zoneNames).toContain(HOSTILE.zone); // on the maps, as text
    // Cell ids live in SVG titles (hover text) and tables: the hostile one is a text node.
    const titles = await page.evaluate(() => Array.from(document.querySelectorAll('svg title'), (t) => t.textContent ?? ''));
    expect(titles.some((t) => t.startsWith(`${'<img src=x onerror=alert(1)>'} (level 0)`))).toBe(true);
    await page.close();
  });
});
